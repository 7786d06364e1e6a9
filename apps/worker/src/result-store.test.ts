/**
 * Results in an S3-compatible bucket: the worker's store writes objects (an s3rver fake on
 * 127.0.0.1, started here), the API streams them back to a project member through the same
 * download route as PostgreSQL-stored files, and deleting the run removes the objects.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import S3rver from 's3rver';
import pg from 'pg';
import { HeadObjectCommand } from '@aws-sdk/client-s3';
import { createTestApp, type TestApp } from '@phaseloop/api/testing/test-app';
import { Study } from '@phaseloop/api/studies/studies.model';
import { Run } from '@phaseloop/api/runs/runs.model';
import { createS3Client, objectKey, pgResultStore, s3ResultStore, type S3Settings } from './result-store';

let fake: S3rver;
let dir: string;
let t: TestApp;
let pool: pg.Pool;
let settings: S3Settings;
const saved = { ...process.env };

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'phaseloop-s3-'));
  fake = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory: dir, configureBuckets: [{ name: 'phaseloop-results' }] });
  const { port } = await fake.run();
  settings = { endpoint: `http://127.0.0.1:${port}`, region: 'us-east-1', bucket: 'phaseloop-results', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER', forcePathStyle: true };
  Object.assign(process.env, {
    S3_ENDPOINT: settings.endpoint, S3_BUCKET: settings.bucket, S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: 'true',
  });
  t = await createTestApp();
  pool = new pg.Pool({ connectionString: t.db.url, max: 2 });
});

afterAll(async () => {
  process.env = saved;
  await pool?.end();
  await t?.close();
  await fake?.close();
  rmSync(dir, { recursive: true, force: true });
});

async function finishedRun(): Promise<{ run: Run; client: Awaited<ReturnType<TestApp['signIn']>>['client'] }> {
  const project = await t.createProject();
  const { client } = await t.signIn({ project, role: 'analyst' });
  const study = await Study.create({ projectId: project.id, name: 'S3 study', definition: { materials: [] }, createdBy: null });
  const run = await Run.create({
    projectId: project.id, studyId: study.id, sweepId: null, number: 1, state: 'succeeded', solverVersion: 'test', submittedBy: null, queuedAt: new Date(),
    snapshot: { study: { id: study.id, name: study.name, revision: 1, definition: { materials: [] } }, materials: [], solverVersion: 'test', submittedAt: new Date().toISOString() },
  });
  return { run, client };
}

describe('result storage', () => {
  it('stores in S3 when configured; the API streams the object and deleting the run removes it', async () => {
    const { run, client } = await finishedRun();
    const store = s3ResultStore(pool, settings);
    // Larger than one PostgreSQL chunk would be, so the download really is streamed in pieces.
    const body = 'frame,time\n' + Array.from({ length: 60_000 }, (_, i) => `${i},${(i / 7).toFixed(6)}`).join('\n') + '\n';
    await store.save(run.id, 'history.csv', 'text/csv', new TextEncoder().encode(body));
    const { rows } = await pool.query<{ storage: string; storage_key: string; size: string }>('SELECT storage, storage_key, size FROM run_artifacts WHERE run_id = $1', [run.id]);
    expect(rows.map((r) => ({ ...r, size: Number(r.size) }))).toEqual([{ storage: 's3', storage_key: objectKey(run.id, 'history.csv'), size: Buffer.byteLength(body) }]);

    const res = await client.get(`/api/runs/${run.id}/results/history.csv`).buffer(true).parse((r, cb) => {
      let text = '';
      r.on('data', (c: Buffer) => (text += c.toString()));
      r.on('end', () => cb(null, text));
    });
    expect(res.status).toBe(200);
    expect(res.body).toBe(body);

    await client.delete(`/api/runs/${run.id}`).expect(204);
    const s3 = createS3Client(settings);
    const gone = await s3.send(new HeadObjectCommand({ Bucket: settings.bucket, Key: objectKey(run.id, 'history.csv') })).then(() => 'present', (err: { name?: string }) => err.name);
    expect(gone).toBe('NotFound');
  });

  it('stores in PostgreSQL chunks by default and clears them for a new attempt', async () => {
    const { run, client } = await finishedRun();
    const store = pgResultStore(pool);
    const bytes = new Uint8Array(1_200_000).map((_, i) => 65 + (i % 26));
    await store.save(run.id, 'frame-0.vtu', 'application/xml', bytes);
    const { rows } = await pool.query<{ n: string }>('SELECT count(*) AS n FROM run_artifact_chunks c JOIN run_artifacts a ON a.id = c.artifact_id WHERE a.run_id = $1', [run.id]);
    // 1.2 MB in 512 KiB chunks (CHUNK_BYTES) → 3 rows.
    expect(Number(rows[0]!.n)).toBe(3);
    const res = await client.get(`/api/runs/${run.id}/results/frame-0.vtu`).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on('data', (c: Buffer) => parts.push(c));
      r.on('end', () => cb(null, Buffer.concat(parts)));
    });
    expect(Buffer.compare(res.body as Buffer, Buffer.from(bytes))).toBe(0);
    await store.clear(run.id);
    expect((await client.get(`/api/runs/${run.id}/results/frame-0.vtu`)).status).toBe(404);
  });
});
