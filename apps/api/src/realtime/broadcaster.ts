import { NOTIFICATION_SOCKET_EVENT, RUN_SOCKET_EVENTS, runRoom, userRoom, type NotificationEvent, type RunStatusEvent } from '@phaseloop/shared';
import type { Server } from 'socket.io';

/** The API's own run events (submitted, cancelled); the worker emits the solver's events itself. */
export interface RunBroadcaster {
  status(event: RunStatusEvent): void;
  /** A new in-app notification, to every socket of that user (on any API instance). */
  notification?(userId: string, event: NotificationEvent): void;
}

export const silentBroadcaster: RunBroadcaster = { status: () => undefined, notification: () => undefined };

export function socketBroadcaster(io: Server): RunBroadcaster {
  return {
    status(event) {
      io.to(runRoom(event.runId)).emit(RUN_SOCKET_EVENTS.status, event);
    },
    notification(userId, event) {
      io.to(userRoom(userId)).emit(NOTIFICATION_SOCKET_EVENT, event);
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
  notification(userId: string, event: NotificationEvent): void {
    this.target.notification?.(userId, event);
  }
}
