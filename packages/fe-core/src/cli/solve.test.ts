/**
 * The solve CLI end to end: every file in examples/ solves, and bad files are reported in
 * sentences with the JSON path and the right exit code, never with a stack trace.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_SOLVE_FAILED, runCli } from './solve';

const examples = resolve(dirname(fileURLToPath(import.meta.url)), '../../../../examples');
const work = mkdtempSync(join(tmpdir(), 'phaseloop-cli-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function cli(args: string[]): { code: number; text: string } {
  const lines: string[] = [];
  const code = runCli(args, (l) => lines.push(l));
  const text = lines.join('\n');
  expect(text).not.toMatch(/\n\s+at .+:\d+:\d+/);
  return { code, text };
}

function writeModel(name: string, mutate: (m: Record<string, unknown>) => void): string {
  const m = JSON.parse(readFileSync(join(examples, 'cantilever-plane-stress.json'), 'utf8')) as Record<string, unknown>;
  mutate(m);
  const file = join(work, name);
  writeFileSync(file, JSON.stringify(m));
  return file;
}

describe('solve CLI', () => {
  const files = readdirSync(examples).filter((f) => f.endsWith('.json'));

  it('has the examples the documentation promises', () => {
    expect(files).toEqual(expect.arrayContaining(['cantilever-beam.json', 'plate-with-hole.json', 'bar-thermal.json']));
  });

  for (const file of files) {
    it(`solves examples/${file}`, () => {
      const out = join(work, file.replace('.json', '.result.json'));
      const vtu = join(work, file.replace('.json', '-vtu'));
      const csv = join(work, file.replace('.json', '-csv'));
      const { code, text } = cli([join(examples, file), '--out', out, '--vtu', vtu, '--csv', csv]);
      expect(code, text).toBe(EXIT_OK);
      const doc = JSON.parse(readFileSync(out, 'utf8'));
      expect(doc.format).toBe('phaseloop-result/1');
      expect(doc.status).toBe('succeeded');
      expect(doc.frames.length).toBeGreaterThan(1);
      expect(existsSync(join(vtu, 'frames.pvd'))).toBe(true);
      expect(existsSync(join(csv, 'history.csv'))).toBe(true);
      expect(text).toMatch(/iteration 0: .*residual/);
    });
  }

  it('cantilever beam example: tip deflection PL³/3EI = 2 mm (closed form)', () => {
    const out = join(work, 'beam-check.json');
    expect(cli([join(examples, 'cantilever-beam.json'), '--out', out, '--quiet']).code).toBe(EXIT_OK);
    const doc = JSON.parse(readFileSync(out, 'utf8'));
    expect(doc.history['tip.uy'].at(-1)).toBeCloseTo(-2, 9);
  });

  it('bar example: −EαΔT = −240 MPa in the held bar (closed form)', () => {
    const out = join(work, 'bar-check.json');
    expect(cli([join(examples, 'bar-thermal.json'), '--out', out, '--quiet']).code).toBe(EXIT_OK);
    const doc = JSON.parse(readFileSync(out, 'utf8'));
    expect(doc.frames.at(-1).nodal.stress[2][0]).toBeCloseTo(-240, 9);
    expect(doc.history['leftEnd.Fx'].at(-1)).toBeCloseTo(240 * 12.5, 6);
  });

  it('usage errors exit with 2', () => {
    expect(cli([]).code).toBe(EXIT_BAD_INPUT);
    expect(cli(['model.json']).text).toMatch(/--out RESULT.json is missing/);
    expect(cli(['a.json', '--out', 'b.json', '--frobnicate']).text).toMatch(/unknown option --frobnicate/);
  });

  it('an unreadable file or invalid JSON exits with 2', () => {
    expect(cli([join(work, 'nope.json'), '--out', join(work, 'r.json')]).text).toMatch(/cannot read .*ENOENT/);
    const bad = join(work, 'bad.json');
    writeFileSync(bad, '{"format": ');
    const r = cli([bad, '--out', join(work, 'r.json')]);
    expect(r.code).toBe(EXIT_BAD_INPUT);
    expect(r.text).toMatch(/not valid JSON/);
  });

  it('a missing field is reported with its JSON path', () => {
    const file = writeModel('missing.json', (m) => delete m.segments);
    const r = cli([file, '--out', join(work, 'r.json')]);
    expect(r.code).toBe(EXIT_BAD_INPUT);
    expect(r.text).toMatch(/at segments: /);
  });

  it('an unknown element type is reported with its JSON path and the allowed types', () => {
    const file = writeModel('type.json', (m) => ((m.elements as { type: string }[])[3].type = 'quad9'));
    const r = cli([file, '--out', join(work, 'r.json')]);
    expect(r.code).toBe(EXIT_BAD_INPUT);
    expect(r.text).toMatch(/at elements\[3\]\.type: element type must be one of .*q8/);
  });

  it('a node id out of range names the element and the node', () => {
    const file = writeModel('node.json', (m) => ((m.elements as { nodes: number[] }[])[11].nodes[2] = 99999));
    const r = cli([file, '--out', join(work, 'r.json')]);
    expect(r.code).toBe(EXIT_BAD_INPUT);
    expect(r.text).toMatch(/at elements\[11\]\.nodes\[2\]: element 12 refers to node 99999, which does not exist/);
  });

  it('an unknown set or material is reported', () => {
    const file = writeModel('refs.json', (m) => {
      (m.supports as { set: string }[])[0].set = 'leftt';
      (m.elements as { material: string }[])[0].material = 'steeel';
    });
    const r = cli([file, '--out', join(work, 'r.json')]);
    expect(r.text).toMatch(/at elements\[0\]\.material: element 1 refers to material "steeel"/);
    expect(r.text).toMatch(/at supports\[0\]\.set: node set "leftt" is not defined/);
  });

  it('an unconstrained model names the node and the free direction (exit 2)', () => {
    const file = writeModel('free.json', (m) => (m.supports = [{ type: 'fixed', set: 'left', dofs: ['uy'] }]));
    const r = cli([file, '--out', join(work, 'r.json'), '--quiet']);
    expect(r.code).toBe(EXIT_BAD_INPUT);
    // Held in y along x = 0 only: x translation and (infinitesimal) rotation about a point of that line stay free.
    expect(r.text).toMatch(/not held: it can move without resistance \(free: translation in x; rotation in the plane about \(0\.000, [\d.]+\)\); the stiffness vanished at node \d+ in direction u[xy]/);
  });

  it('a solve that cannot converge exits with 1, keeps the frames and says where and what to try', () => {
    const file = writeModel('limit.json', (m) => {
      m.materials = { steel: { model: 'j2-plastic', E: 200000, nu: 0.3, sigma_y: 100 } };
      m.segments = [{ name: 'overload', targets: { shear: 30 }, increments: { initial: 0.25, min: 0.05, max: 0.25, maxIterations: 6 } }];
    });
    const out = join(work, 'limit-result.json');
    const r = cli([file, '--out', out, '--quiet']);
    expect(r.code).toBe(EXIT_SOLVE_FAILED);
    expect(r.text).toMatch(/Segment "overload" stopped at t = .* Try /);
    const doc = JSON.parse(readFileSync(out, 'utf8'));
    expect(doc.status).toBe('failed');
    expect(doc.frames.length).toBeGreaterThan(1);
  });
});
