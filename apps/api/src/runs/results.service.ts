/**
 * Reading what the worker stored: convergence log, frames' history values and result files
 * (streamed chunk by chunk so a large VTU never sits whole in the API's memory).
 */
import type { Response } from 'express';
import type pg from 'pg';
import { QueryTypes, type Sequelize } from 'sequelize';
import { pipeline } from 'node:stream/promises';
import { HttpError, notFound } from '../http/errors';
import type { AppContext } from '../context';
import type { RunLogLine } from '@phaseloop/shared';
import { objectStoreFromEnv } from './object-store';

export interface IterationRow {
  seq: number; segment: number; increment: number; iteration: number; time: number;
  residualNorm: number; correctionNorm: number; cutBacks: number;
}

export async function listIterations(sequelize: Sequelize, runId: string, afterSeq: number, limit: number): Promise<IterationRow[]> {
  return sequelize.query<IterationRow>(
    `SELECT seq, segment, increment, iteration, time, residual_norm AS "residualNorm", correction_norm AS "correctionNorm", cut_backs AS "cutBacks"
       FROM run_iterations WHERE run_id = :runId AND seq > :afterSeq ORDER BY seq LIMIT :limit`,
    { replacements: { runId, afterSeq, limit }, type: QueryTypes.SELECT },
  );
}

export async function listLogLines(sequelize: Sequelize, runId: string, afterSeq: number, limit: number): Promise<RunLogLine[]> {
  const rows = await sequelize.query<Omit<RunLogLine, 'at'> & { at: Date }>(
    `SELECT seq, attempt, level, message, created_at AS "at"
       FROM run_log_lines WHERE run_id = :runId AND seq > :afterSeq ORDER BY seq LIMIT :limit`,
    { replacements: { runId, afterSeq, limit }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, at: new Date(r.at).toISOString() }));
}

export interface FrameRow { frame: number; segment: number; increment: number; time: number; history: Record<string, number> }

export async function listFrames(sequelize: Sequelize, runId: string): Promise<FrameRow[]> {
  return sequelize.query<FrameRow>(
    'SELECT frame, segment, increment, time, history FROM run_frames WHERE run_id = :runId ORDER BY frame',
    { replacements: { runId }, type: QueryTypes.SELECT },
  );
}

export interface ArtifactRow { id: string; name: string; contentType: string; size: number; complete: boolean; createdAt: string }

export async function listArtifacts(sequelize: Sequelize, runId: string): Promise<ArtifactRow[]> {
  const rows = await sequelize.query<ArtifactRow & { createdAt: Date }>(
    `SELECT id, name, content_type AS "contentType", size, complete, created_at AS "createdAt"
       FROM run_artifacts WHERE run_id = :runId ORDER BY name`,
    { replacements: { runId }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, size: Number(r.size), createdAt: new Date(r.createdAt).toISOString() }));
}

export async function streamArtifact(pool: pg.Pool, runId: string, name: string, res: Response): Promise<void> {
  const { rows } = await pool.query<{ id: string; content_type: string; size: string; storage: string; storage_key: string | null }>(
    'SELECT id, content_type, size, storage, storage_key FROM run_artifacts WHERE run_id = $1 AND name = $2 AND complete',
    [runId, name],
  );
  const artifact = rows[0];
  if (!artifact) throw notFound('Result file');
  res.status(200);
  res.setHeader('Content-Type', artifact.content_type);
  res.setHeader('Content-Length', artifact.size);
  res.setHeader('Content-Disposition', `attachment; filename="${name.replace(/[^A-Za-z0-9._-]/g, '_')}"`);
  if (artifact.storage === 's3') {
    const store = objectStoreFromEnv();
    if (!store || !artifact.storage_key) throw new HttpError(503, 'The result store holding this file is not configured on this server');
    await pipeline(await store.open(artifact.storage_key), res);
    return;
  }
  // One chunk row at a time: neither the API nor the database holds the whole file for a download.
  let seq = -1;
  for (;;) {
    const chunk = await pool.query<{ seq: number; bytes: Buffer }>(
      'SELECT seq, bytes FROM run_artifact_chunks WHERE artifact_id = $1 AND seq > $2 ORDER BY seq LIMIT 1',
      [artifact.id, seq],
    );
    const row = chunk.rows[0];
    if (!row) break;
    seq = row.seq;
    if (!res.write(row.bytes)) await new Promise((resolve) => res.once('drain', resolve));
  }
  res.end();
}

/** Removes a run's result files: objects in S3 first, then the rows (chunks cascade). */
export async function deleteStoredResults(ctx: AppContext, runId: string): Promise<void> {
  const { rows } = await ctx.pool.query<{ storage_key: string }>(
    `SELECT storage_key FROM run_artifacts WHERE run_id = $1 AND storage = 's3' AND storage_key IS NOT NULL`,
    [runId],
  );
  if (rows.length > 0) {
    const store = objectStoreFromEnv();
    if (!store) throw new HttpError(503, 'The result store holding this run\'s files is not configured on this server');
    await store.remove(rows.map((r) => r.storage_key));
  }
  await ctx.pool.query('DELETE FROM run_artifacts WHERE run_id = $1', [runId]);
}
