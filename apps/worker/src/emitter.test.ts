/**
 * The stack-notes gotcha: @socket.io/postgres-emitter 0.1.1 publishes without `nsp`, and the
 * adapter routes by it (socket.io-adapter ClusterAdapter: BROADCAST = 3, `nsp` selects the
 * namespace). What goes out on the NOTIFY channel must carry the namespace.
 */
import { describe, expect, it } from 'vitest';
import type pg from 'pg';
import { RUN_SOCKET_EVENTS, runRoom } from '@phaseloop/shared';
import { createRunEmitter } from './emitter';

function capturingPool(): { pool: pg.Pool; sent: { sql: string; values: unknown[] }[] } {
  const sent: { sql: string; values: unknown[] }[] = [];
  const pool = { query: async (sql: string, values: unknown[]) => { sent.push({ sql, values }); return { rows: [] }; } } as unknown as pg.Pool;
  return { pool, sent };
}

describe('run event emitter', () => {
  it('publishes a broadcast to the run room on the default namespace channel, with nsp stamped', async () => {
    const { pool, sent } = capturingPool();
    const events = createRunEmitter(pool);
    const runId = '7f1c3a52-2b7e-4c55-9a43-0c4d9d8f1e21';
    events.status({ runId, state: 'running', message: '', at: '2026-01-01T00:00:00.000Z' });
    await new Promise((r) => setImmediate(r));
    expect(sent).toHaveLength(1);
    const [channel, payload] = sent[0]!.values as [string, string];
    expect(sent[0]!.sql).toContain('pg_notify');
    expect(channel).toBe('socket.io#/');
    const doc = JSON.parse(payload) as { type: number; nsp: string; data: { packet: { data: unknown[] }; opts: { rooms: string[] } } };
    expect(doc.type).toBe(3);
    expect(doc.nsp).toBe('/');
    expect(doc.data.opts.rooms).toEqual([runRoom(runId)]);
    expect(doc.data.packet.data[0]).toBe(RUN_SOCKET_EVENTS.status);
    expect(doc.data.packet.data[1]).toMatchObject({ runId, state: 'running' });
  });
});
