/**
 * The API's side of S3-compatible result storage (configured by S3_BUCKET, S3_ENDPOINT,
 * S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY, S3_REGION, S3_FORCE_PATH_STYLE — the same variables the
 * worker reads). Rows of run_artifacts say which store holds each file.
 */
import { DeleteObjectsCommand, GetObjectCommand, S3Client } from '@aws-sdk/client-s3';
import type { Readable } from 'node:stream';

export interface ObjectStore {
  bucket: string;
  open(key: string): Promise<Readable>;
  remove(keys: string[]): Promise<void>;
}

const clients = new Map<string, ObjectStore>();

/** The bucket from the environment (read at call time, so tests can point it at a local fake). */
export function objectStoreFromEnv(env: NodeJS.ProcessEnv = process.env): ObjectStore | null {
  const bucket = env.S3_BUCKET;
  if (!bucket) return null;
  const cacheKey = [env.S3_ENDPOINT, bucket, env.S3_ACCESS_KEY_ID].join('|');
  const cached = clients.get(cacheKey);
  if (cached) return cached;
  const s3 = new S3Client({
    endpoint: env.S3_ENDPOINT || undefined,
    region: env.S3_REGION || 'us-east-1',
    forcePathStyle: env.S3_FORCE_PATH_STYLE !== 'false',
    credentials: env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY ? { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY } : undefined,
  });
  const store: ObjectStore = {
    bucket,
    async open(key) {
      const out = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
      return out.Body as Readable;
    },
    async remove(keys) {
      for (let i = 0; i < keys.length; i += 1000) {
        await s3.send(new DeleteObjectsCommand({ Bucket: bucket, Delete: { Objects: keys.slice(i, i + 1000).map((Key) => ({ Key })), Quiet: true } }));
      }
    },
  };
  clients.set(cacheKey, store);
  return store;
}
