/**
 * Live events of one run over Socket.IO (rooms per run, event names from packages/shared
 * runs.ts). Joins the run's room on connect and again after every reconnect, so a dropped
 * connection resumes by itself; the caller backfills from the REST endpoints.
 */
import { onBeforeUnmount } from 'vue';
import { io, type Socket } from 'socket.io-client';
import {
  RUN_SOCKET_EVENTS,
  type RunClientToServerEvents,
  type RunFrameEvent,
  type RunIterationEvent,
  type RunLogEvent,
  type RunServerToClientEvents,
  type RunStatusEvent,
} from '@phaseloop/shared';

export interface RunStreamHandlers {
  status(e: RunStatusEvent): void;
  iteration(e: RunIterationEvent): void;
  frame(e: RunFrameEvent): void;
  log(e: RunLogEvent): void;
  /** Called after every (re)join, so the caller can fetch what it missed while disconnected. */
  joined(): void;
}

export function useRunStream(runId: string, handlers: RunStreamHandlers): { close(): void } {
  const socket: Socket<RunServerToClientEvents, RunClientToServerEvents> = io({ path: '/socket.io', withCredentials: true, transports: ['websocket', 'polling'] });
  socket.on('connect', () => {
    socket.emit(RUN_SOCKET_EVENTS.watch, { runId }, (answer) => { if (answer.ok) handlers.joined(); });
  });
  socket.on('run:status', (e) => { if (e.runId === runId) handlers.status(e); });
  socket.on('run:iteration', (e) => { if (e.runId === runId) handlers.iteration(e); });
  socket.on('run:frame', (e) => { if (e.runId === runId) handlers.frame(e); });
  socket.on('run:log', (e) => { if (e.runId === runId) handlers.log(e); });

  function close(): void {
    if (socket.connected) socket.emit(RUN_SOCKET_EVENTS.unwatch, { runId });
    socket.close();
  }
  onBeforeUnmount(close);
  return { close };
}
