/**
 * Results viewer benchmark: the web app's viewport bench page (/bench/viewport, a generated quad
 * mesh animated like a run's frames) in headless Chromium at 25k, 100k and 400k quads:
 * time to the first frame, frame time while orbiting (median, p95) and the cost of a frame
 * change (the in-place update of positions and colours, and until the frame is on screen).
 *
 * The web app is built into .phaseloop/bench-web when its sources are newer than that build,
 * then served by a small static server here. The page needs a signed-in user; the bench answers
 * /api/auth/me with a bench viewer and every other API call with 404, so no database is needed.
 * `--cells 160,320` picks the sizes. Writes its section of bench/results.md.
 */
import { createReadStream, existsSync, readdirSync, statSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import { extname, join, normalize } from 'node:path';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { chromium } from '@playwright/test';
import { machineLine } from './lib/machine';
import { markdownTable, writeSection } from './lib/results';

const root = fileURLToPath(new URL('../', import.meta.url));
const dist = join(root, '.phaseloop', 'bench-web');
const chromiumPath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const argCells = process.argv.indexOf('--cells');
const CELLS = argCells > 0 ? (process.argv[argCells + 1] ?? '').split(',').map(Number).filter((c) => c > 0) : [160, 320, 632];
const FRAMES = 30;
const ORBIT = 90;

interface Measurement {
  elements: number; nodes: number; frames: number; orbitSteps: number; firstFrameMs: number;
  orbitMedianMs: number; orbitP95Ms: number; updateMedianMs: number; updateP95Ms: number;
  frameChangeMedianMs: number; frameChangeP95Ms: number; medianDrawCallMs: number;
}

/** Newest modification time under a folder (the build is stale when a source is newer). */
function newest(dir: string): number {
  let t = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    if (entry.name === 'node_modules' || entry.name === 'dist') continue;
    const p = join(dir, entry.name);
    t = Math.max(t, entry.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

function buildIfNeeded(): void {
  const index = join(dist, 'index.html');
  const sources = Math.max(...['apps/web/src', 'apps/web/index.html', 'packages/shared/src', 'packages/fe-core/src'].map((p) => {
    const full = join(root, p);
    return statSync(full).isDirectory() ? newest(full) : statSync(full).mtimeMs;
  }));
  if (existsSync(index) && statSync(index).mtimeMs > sources) return;
  console.log('bench viewer: building the web app into .phaseloop/bench-web');
  const build = spawnSync('npm', ['run', '-s', 'build', '-w', 'apps/web', '--', '--outDir', dist, '--emptyOutDir'], { cwd: root, stdio: ['ignore', 'ignore', 'inherit'] });
  if (build.status !== 0) throw new Error('bench viewer: the web build failed');
}

const TYPES: Record<string, string> = { '.html': 'text/html', '.js': 'text/javascript', '.css': 'text/css', '.woff2': 'font/woff2', '.woff': 'font/woff', '.svg': 'image/svg+xml', '.png': 'image/png' };

/** Static files of the build with the single-page fallback. */
function serve(): Promise<{ server: Server; url: string }> {
  const server = createServer((req, res) => {
    const path = normalize(decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname)).replace(/^(\.\.[/\\])+/, '');
    let file = join(dist, path);
    if (!file.startsWith(dist) || !existsSync(file) || statSync(file).isDirectory()) file = join(dist, 'index.html');
    res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream' });
    createReadStream(file).pipe(res);
  });
  return new Promise((resolve) => server.listen(0, '127.0.0.1', () => {
    const address = server.address();
    resolve({ server, url: `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}` });
  }));
}

async function measure(url: string, cells: number): Promise<Measurement> {
  const browser = await chromium.launch({ executablePath: chromiumPath, headless: true, args: ['--use-angle=swiftshader', '--enable-unsafe-swiftshader'] });
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await page.route('**/api/**', (route) => {
      if (new URL(route.request().url()).pathname === '/api/auth/me') {
        return route.fulfill({ json: { user: { id: 'bench', email: 'bench@phaseloop.invalid', name: 'Bench viewer', isAdmin: false }, memberships: [] } });
      }
      return route.fulfill({ status: 404, json: { error: { code: 'not_found', message: 'Not served by the bench' } } });
    });
    await page.route('**/socket.io/**', (route) => route.abort());
    const out = page.getByTestId('bench-result');
    // Warm-up on a tiny mesh: scripts parsed and shaders compiled, so the first frame measured
    // below is the mesh's own cost (geometry build, upload, draw), not the browser's start-up.
    await page.goto(`${url}/bench/viewport?cells=10&frames=2&orbit=2`);
    await out.filter({ hasText: 'firstFrameMs' }).waitFor({ timeout: 120_000 });
    await page.goto(`${url}/bench/viewport?cells=${cells}&frames=${FRAMES}&orbit=${ORBIT}`);
    await out.filter({ hasText: 'firstFrameMs' }).waitFor({ timeout: 900_000 });
    return JSON.parse((await out.textContent()) ?? '{}') as Measurement;
  } finally {
    await browser.close();
  }
}

async function main(): Promise<void> {
  buildIfNeeded();
  const { server, url } = await serve();
  const machine = machineLine();
  const rows: string[][] = [];
  try {
    for (const cells of CELLS) {
      console.log(`bench viewer: ${cells} × ${cells} quads`);
      const m = await measure(url, cells);
      console.log(JSON.stringify(m));
      rows.push([
        m.elements.toLocaleString('en-US'), m.nodes.toLocaleString('en-US'), m.firstFrameMs.toFixed(0),
        `${m.orbitMedianMs.toFixed(1)} / ${m.orbitP95Ms.toFixed(1)}`, (1000 / m.orbitMedianMs).toFixed(1),
        `${m.updateMedianMs.toFixed(1)} / ${m.updateP95Ms.toFixed(1)}`, `${m.frameChangeMedianMs.toFixed(1)} / ${m.frameChangeP95Ms.toFixed(1)}`,
      ]);
    }
  } finally {
    server.close();
  }
  writeSection('viewer', [
    '## Results viewer: 3D viewport frame times (bench/viewer.bench.ts)',
    '',
    machine,
    '',
    `Headless Chromium (${chromiumPath}) with **software WebGL** (SwiftShader: no GPU on this machine), 1280 × 800 page, the viewport`,
    `about 1200 × 600 px. Generated structured quad mesh on /bench/viewport, ${FRAMES} precomputed frames of displacement and contour;`,
    `element outlines and 4× multisampling are used up to 20 000 elements. First frame: after a warm-up page on a tiny mesh,`,
    `from handing the mesh to the viewport until its first frame is drawn. Orbit: the camera turns every frame for ${ORBIT} frames, time between displayed`,
    'frames. Frame change: the new frame\'s positions and colours written in place (update), and until it is on screen.',
    '',
    markdownTable(['quads', 'nodes', 'first frame (ms)', 'orbit frame median / p95 (ms)', 'orbit fps', 'frame update median / p95 (ms)', 'frame change on screen median / p95 (ms)'], rows),
    '',
    'Software rasterisation on two shared cores dominates the orbit and on-screen times: they scale with the',
    'pixels and triangles drawn, and a desktop GPU draws the same buffers many times faster. The update column is CPU',
    'work in the page (typed-array rewrite of positions and colours, no geometry rebuilt, no normals recomputed) and',
    'carries over to real machines. Numbers from a shared machine are noisy (the load above is at the start; other',
    'engineers\' builds and tests ran beside it): repeated runs here differed by up to 2× in the orbit and on-screen',
    'columns, so take them as orders of magnitude.',
  ].join('\n'));
  console.log('bench viewer: section "viewer" of bench/results.md rewritten');
}

main().then(() => process.exit(0), (err: unknown) => {
  console.error(err);
  process.exit(1);
});
