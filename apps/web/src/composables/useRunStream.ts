/**
 * Live events of one run over the tab's shared Socket.IO connection (rooms per run, event names
 * from packages/shared runs.ts). Joins the run's room at once if the socket is already up, and on
 * every (re)connect, so a dropped connection resumes by itself; the caller backfills from the REST
 * endpoints.
 */
import { onBeforeUnmount } from 'vue';
import {
  RUN_SOCKET_EVENTS,
  type RunFrameEvent,
  type RunIterationEvent,
  type RunLogEvent,
  type RunStatusEvent,
} from '@phaseloop/shared';
import { acquireSocket, createKeyCounter } from './useSocket';

export interface RunStreamHandlers {
  status(e: RunStatusEvent): void;
  iteration(e: RunIterationEvent): void;
  frame(e: RunFrameEvent): void;
  log(e: RunLogEvent): void;
  /** Called after every (re)join, so the caller can fetch what it missed while disconnected. */
  joined(): void;
}

/** Run rooms this tab follows: the room is left only when the last watcher of a run goes. */
const watchers = createKeyCounter();

export function useRunStream(runId: string, handlers: RunStreamHandlers): { close(): void } {
  const lease = acquireSocket();
  const { socket } = lease;
  watchers.add(runId);

  // Joining is idempotent on the server, so every watcher asks for itself and gets its own ack.
  const join = (): void => {
    socket.emit(RUN_SOCKET_EVENTS.watch, { runId }, (answer) => { if (answer.ok) handlers.joined(); });
  };
  const onStatus = (e: RunStatusEvent): void => { if (e.runId === runId) handlers.status(e); };
  const onIteration = (e: RunIterationEvent): void => { if (e.runId === runId) handlers.iteration(e); };
  const onFrame = (e: RunFrameEvent): void => { if (e.runId === runId) handlers.frame(e); };
  const onLog = (e: RunLogEvent): void => { if (e.runId === runId) handlers.log(e); };

  socket.on('connect', join);
  socket.on('run:status', onStatus);
  socket.on('run:iteration', onIteration);
  socket.on('run:frame', onFrame);
  socket.on('run:log', onLog);
  lease.onRelease(() => {
    socket.off('connect', join);
    socket.off('run:status', onStatus);
    socket.off('run:iteration', onIteration);
    socket.off('run:frame', onFrame);
    socket.off('run:log', onLog);
  });
  // The bell may have connected the shared socket already; 'connect' would then not fire again.
  if (socket.connected) join();

  let closed = false;
  function close(): void {
    if (closed) return;
    closed = true;
    if (watchers.remove(runId) && socket.connected) socket.emit(RUN_SOCKET_EVENTS.unwatch, { runId });
    lease.release();
  }
  onBeforeUnmount(close);
  return { close };
}
