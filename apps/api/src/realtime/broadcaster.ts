import { RUN_SOCKET_EVENTS, runRoom, type RunStatusEvent } from '@phaseloop/shared';
import type { Server } from 'socket.io';

/** The API's own run events (submitted, cancelled); the worker emits the solver's events itself. */
export interface RunBroadcaster {
  status(event: RunStatusEvent): void;
}

export const silentBroadcaster: RunBroadcaster = { status: () => undefined };

export function socketBroadcaster(io: Server): RunBroadcaster {
  return {
    status(event) {
      io.to(runRoom(event.runId)).emit(RUN_SOCKET_EVENTS.status, event);
    },
  };
}

/** A broadcaster whose target is set once the Socket.IO server exists (it needs the HTTP server). */
export class LateBroadcaster implements RunBroadcaster {
  private target: RunBroadcaster = silentBroadcaster;
  attach(target: RunBroadcaster): void {
    this.target = target;
  }
  status(event: RunStatusEvent): void {
    this.target.status(event);
  }
}
