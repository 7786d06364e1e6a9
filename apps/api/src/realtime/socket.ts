/**
 * Socket.IO for live run progress. Sockets authenticate with the same session cookie as the REST
 * API; a browser asks to follow a run and joins its room only if it may read the run. Rooms are
 * shared across API instances through the PostgreSQL adapter, and workers publish into them with
 * the PostgreSQL emitter, so no process needs to know where the others run.
 */
import type { Server as HttpServer, IncomingMessage, ServerResponse } from 'node:http';
import { Server } from 'socket.io';
import { createAdapter } from '@socket.io/postgres-adapter';
import { RUN_SOCKET_EVENTS, runRoom, userRoom, type RunClientToServerEvents, type RunServerToClientEvents } from '@phaseloop/shared';
import type { AppContext } from '../context';
import type { BuiltApp } from '../app';
import type { SessionUser } from '../auth/session-user';
import { requireRun } from '../runs/runs.service';

type EngineMiddleware = (req: IncomingMessage, res: ServerResponse, next: (err?: unknown) => void) => void;

/** Session lookups only on the handshake request; later polling requests carry the socket id. */
function onlyForHandshake(middleware: EngineMiddleware): EngineMiddleware {
  return (req, res, next) => {
    const isHandshake = (req as IncomingMessage & { _query?: Record<string, string> })._query?.sid === undefined;
    if (isHandshake) middleware(req, res, next);
    else next();
  };
}

export type PhaseloopIo = Server<RunClientToServerEvents, RunServerToClientEvents>;

export function attachSocketServer(httpServer: HttpServer, built: BuiltApp, ctx: AppContext): PhaseloopIo {
  const io: PhaseloopIo = new Server(httpServer, {
    path: '/socket.io',
    serveClient: false,
    adapter: createAdapter(ctx.pool, { errorHandler: (err: Error) => ctx.logger.warn({ err }, 'socket.io adapter') }),
  });
  io.engine.use(onlyForHandshake(built.sessionMiddleware as unknown as EngineMiddleware));
  io.engine.use(onlyForHandshake(built.passport.session() as unknown as EngineMiddleware));
  io.engine.use(
    onlyForHandshake((req, res, next) => {
      if ((req as IncomingMessage & { user?: SessionUser }).user) return next();
      res.writeHead(401, { 'Content-Type': 'application/json' });
      res.end(JSON.stringify({ error: { code: 'not-signed-in', message: 'Please sign in' } }));
    }),
  );

  io.on('connection', (socket) => {
    const user = (socket.request as IncomingMessage & { user?: SessionUser }).user;
    if (!user) {
      socket.disconnect(true);
      return;
    }
    // Notifications for this user reach every tab they have open, on whichever API instance.
    void socket.join(userRoom(user.id));
    socket.on(RUN_SOCKET_EVENTS.watch, (req, ack) => {
      const reply = typeof ack === 'function' ? ack : () => undefined;
      const runId = typeof req?.runId === 'string' ? req.runId : '';
      requireRun(user, runId)
        .then(async () => {
          await socket.join(runRoom(runId));
          reply({ ok: true });
        })
        .catch(() => reply({ ok: false, message: 'Run not found' }));
    });
    socket.on(RUN_SOCKET_EVENTS.unwatch, (req) => {
      if (typeof req?.runId === 'string') void socket.leave(runRoom(req.runId));
    });
  });
  return io;
}
