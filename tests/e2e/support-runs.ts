/**
 * A quick run that succeeds, for specs that need a finished run without depending on another
 * spec having made one: the superelastic strip of examples/ (33 nodes), stretched a little less,
 * solved with the demo project's approved library material, submitted through the API.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect, type APIRequestContext } from '@playwright/test';
import { DEMO_PROJECT, apiPost } from './support';

const here = path.dirname(fileURLToPath(import.meta.url));

export interface QuickRun { runId: string; studyId: string; projectId: string }

interface RunAnswer { id: string; state: string; studyId: string }

export async function demoProjectId(request: APIRequestContext): Promise<string> {
  const { items } = (await (await request.get('/api/projects')).json()) as { items: { id: string; name: string }[] };
  const project = items.find((p) => p.name === DEMO_PROJECT);
  expect(project, DEMO_PROJECT).toBeTruthy();
  return project?.id ?? '';
}

/** The strip model with its material replaced by a reference to an approved library version. */
function stripModel(materialVersionId: string): Record<string, unknown> {
  const model = JSON.parse(readFileSync(path.resolve(here, '../../examples/superelastic-strip.json'), 'utf8')) as {
    materials: Record<string, unknown>; segments: { targets: Record<string, number> }[];
  };
  const name = Object.keys(model.materials)[0] ?? 'strip';
  // 0.4 mm over the 20 mm strip (2 %): into the transformation plateau of the demo material, and quick.
  const segments = model.segments.map((s) => ({ ...s, targets: Object.fromEntries(Object.entries(s.targets).map(([k, v]) => [k, v === 0 ? 0 : 0.4])) }));
  return { ...model, title: 'Quick strip (demo values)', materials: { [name]: { materialVersionId } }, segments };
}

/**
 * Submits a quick strip run in the demo stent project as the signed-in user (an analyst or admin)
 * and waits until the worker has solved it.
 */
export async function submitQuickRun(request: APIRequestContext, studyName: string): Promise<QuickRun> {
  const projectId = await demoProjectId(request);
  const { items } = (await (await request.get(`/api/projects/${projectId}/materials`)).json()) as { items: { latestVersionId: string | null; status: string }[] };
  const approved = items.find((m) => m.status === 'approved' && m.latestVersionId);
  expect(approved, 'an approved demo material').toBeTruthy();
  const study = (await apiPost(request, `/api/projects/${projectId}/studies`, { name: studyName, definition: { model: stripModel(approved?.latestVersionId ?? '') } })) as { id: string };
  const run = (await apiPost(request, `/api/studies/${study.id}/runs`, {})) as RunAnswer;
  await expect.poll(async () => ((await (await request.get(`/api/runs/${run.id}`)).json()) as RunAnswer).state, {
    message: `quick run ${run.id} solved`, timeout: 300_000, intervals: [500, 1000, 2000],
  }).toMatch(/^(succeeded|failed|cancelled)$/);
  const final = (await (await request.get(`/api/runs/${run.id}`)).json()) as RunAnswer & { message: string };
  expect(final.state, final.message).toBe('succeeded');
  return { runId: run.id, studyId: study.id, projectId };
}

/** A run of the demo project that succeeded: any one already there, or a new quick run. */
export async function succeededDemoRun(request: APIRequestContext): Promise<QuickRun> {
  const projectId = await demoProjectId(request);
  const { items } = (await (await request.get(`/api/projects/${projectId}/runs`)).json()) as { items: { id: string; studyId: string; state: string }[] };
  const done = items.find((r) => r.state === 'succeeded');
  if (done) return { runId: done.id, studyId: done.studyId, projectId };
  return submitQuickRun(request, 'Quick strip for layout checks (demo values)');
}
