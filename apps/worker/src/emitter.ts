/**
 * Publishes run events into Socket.IO rooms from outside the API, through PostgreSQL NOTIFY.
 *
 * @socket.io/postgres-emitter 0.1.1 leaves the namespace out of what it publishes, and the
 * adapter (0.5.0) on the API side routes messages by that field and silently drops those without
 * it. So every published document gets the emitter's namespace stamped on before it goes out.
 */
import type pg from 'pg';
import { BroadcastOperator, Emitter } from '@socket.io/postgres-emitter';
import {
  RUN_SOCKET_EVENTS, runRoom,
  type RunFrameEvent, type RunIterationEvent, type RunLogEvent, type RunStatusEvent,
} from '@phaseloop/shared';

interface PublishingOperator {
  emitter: { nsp: string };
  publish(document: Record<string, unknown>): Promise<void>;
}

let stamped = false;

/** Patches the operator's publish once per process: idempotent, and a no-op for fixed releases. */
function stampNamespaceOnPublish(): void {
  if (stamped) return;
  stamped = true;
  const proto = BroadcastOperator.prototype as unknown as PublishingOperator;
  const original = proto.publish;
  proto.publish = function publishWithNamespace(this: PublishingOperator, document: Record<string, unknown>) {
    if (document.nsp === undefined) document.nsp = this.emitter.nsp;
    return original.call(this, document);
  };
}

export interface RunEventSink {
  status(e: RunStatusEvent): void;
  iteration(e: RunIterationEvent): void;
  frame(e: RunFrameEvent): void;
  log(e: RunLogEvent): void;
}

/**
 * The emitter fires each NOTIFY without waiting for the previous one, and a pool runs them on
 * several connections at once, so a busy machine can deliver iteration events out of order. One
 * query at a time keeps the order the solver produced them in.
 */
function oneQueryAtATime(pool: pg.Pool): pg.Pool {
  let last: Promise<unknown> = Promise.resolve();
  const query = (text: string, values?: unknown[]) => {
    const next = last.then(() => pool.query(text, values));
    last = next.catch(() => undefined);
    return next;
  };
  return { query } as unknown as pg.Pool;
}

export function createRunEmitter(pool: pg.Pool): RunEventSink {
  stampNamespaceOnPublish();
  const emitter = new Emitter(oneQueryAtATime(pool));
  return {
    status: (e) => void emitter.to(runRoom(e.runId)).emit(RUN_SOCKET_EVENTS.status, e),
    iteration: (e) => void emitter.to(runRoom(e.runId)).emit(RUN_SOCKET_EVENTS.iteration, e),
    frame: (e) => void emitter.to(runRoom(e.runId)).emit(RUN_SOCKET_EVENTS.frame, e),
    log: (e) => void emitter.to(runRoom(e.runId)).emit(RUN_SOCKET_EVENTS.log, e),
  };
}
