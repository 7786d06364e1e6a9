/**
 * Where result files go: PostgreSQL rows (chunked) by default, so a worker needs nothing but the
 * database; an S3-compatible bucket when S3_BUCKET is set (large deployments). Either way the
 * run_artifacts row is the index the API serves downloads from.
 */
import type pg from 'pg';
import { DeleteObjectsCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { deleteResultRows, saveFile } from './run-store';

export interface ResultStore {
  readonly kind: 'pg' | 's3';
  save(runId: string, name: string, contentType: string, bytes: Uint8Array): Promise<void>;
  /** Removes every stored result of a run (before a new attempt, or when the run is deleted). */
  clear(runId: string, client?: pg.PoolClient): Promise<void>;
}

export interface S3Settings {
  endpoint?: string;
  region: string;
  bucket: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  forcePathStyle: boolean;
}

/** S3 settings from the environment, or null for PostgreSQL storage. */
export function s3SettingsFromEnv(env: NodeJS.ProcessEnv): S3Settings | null {
  if (!env.S3_BUCKET) return null;
  return {
    endpoint: env.S3_ENDPOINT || undefined,
    region: env.S3_REGION || 'us-east-1',
    bucket: env.S3_BUCKET,
    accessKeyId: env.S3_ACCESS_KEY_ID || undefined,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY || undefined,
    forcePathStyle: env.S3_FORCE_PATH_STYLE !== 'false',
  };
}

export function createS3Client(s: S3Settings): S3Client {
  return new S3Client({
    endpoint: s.endpoint, region: s.region, forcePathStyle: s.forcePathStyle,
    credentials: s.accessKeyId && s.secretAccessKey ? { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey } : undefined,
  });
}

export function objectKey(runId: string, name: string): string {
  return `runs/${runId}/${name}`;
}

export function pgResultStore(pool: pg.Pool): ResultStore {
  return {
    kind: 'pg',
    save: (runId, name, contentType, bytes) => saveFile(pool, runId, name, contentType, bytes),
    clear: (runId, client) => deleteResultRows(client ?? pool, runId),
  };
}

export function s3ResultStore(pool: pg.Pool, settings: S3Settings): ResultStore {
  const s3 = createS3Client(settings);
  return {
    kind: 's3',
    async save(runId, name, contentType, bytes) {
      const key = objectKey(runId, name);
      await s3.send(new PutObjectCommand({ Bucket: settings.bucket, Key: key, Body: bytes, ContentType: contentType, ContentLength: bytes.byteLength }));
      await pool.query(
        `INSERT INTO run_artifacts (run_id, name, content_type, size, storage, storage_key, complete) VALUES ($1, $2, $3, $4, 's3', $5, true)
         ON CONFLICT (run_id, name) DO UPDATE SET content_type = EXCLUDED.content_type, size = EXCLUDED.size, storage = 's3', storage_key = EXCLUDED.storage_key, complete = true`,
        [runId, name, contentType, bytes.byteLength, key],
      );
    },
    async clear(runId, client) {
      const db = client ?? pool;
      const { rows } = await db.query<{ storage_key: string }>(`SELECT storage_key FROM run_artifacts WHERE run_id = $1 AND storage = 's3' AND storage_key IS NOT NULL`, [runId]);
      for (let i = 0; i < rows.length; i += 1000) {
        const batch = rows.slice(i, i + 1000).map((r) => ({ Key: r.storage_key }));
        await s3.send(new DeleteObjectsCommand({ Bucket: settings.bucket, Delete: { Objects: batch, Quiet: true } }));
      }
      await deleteResultRows(db, runId);
    },
  };
}

export function resultStoreFromEnv(pool: pg.Pool, env: NodeJS.ProcessEnv = process.env): ResultStore {
  const s3 = s3SettingsFromEnv(env);
  return s3 ? s3ResultStore(pool, s3) : pgResultStore(pool);
}
