/**
 * One Socket.IO connection per browser tab. The notification bell and the run monitor both need
 * live events; each opening its own socket doubled the connections (and the session lookups on
 * the server) on every run page. Users take a lease on the shared socket and hand it back when
 * they unmount; the socket closes when the last lease is returned, and at once on sign-out,
 * because a socket stays authenticated as whoever was signed in when it connected.
 */
import { onBeforeUnmount } from 'vue';
import { io, type Socket } from 'socket.io-client';
import type { NotificationEvent, RunClientToServerEvents, RunServerToClientEvents } from '@phaseloop/shared';
import { NOTIFICATION_SOCKET_EVENT } from '@phaseloop/shared';

/** What the hub itself needs from a socket; tests pass a fake. */
export interface ClosableSocket {
  readonly connected: boolean;
  close(): unknown;
}

export interface SocketLease<S> {
  readonly socket: S;
  /** Registers cleanup (typically `socket.off(event, handler)`) that runs when the lease is released. */
  onRelease(teardown: () => void): void;
  /** Runs this user's cleanup and gives the socket back; calling it again does nothing. */
  release(): void;
}

export interface SocketHub<S> {
  acquire(): SocketLease<S>;
  /** Closes the shared socket now, whoever still holds it; the next `acquire` opens a fresh one. */
  closeShared(): void;
  /** How many leases are held on the current socket (0 when none is open). */
  users(): number;
}

interface HubEntry<S> {
  socket: S;
  users: number;
}

export function createSocketHub<S extends ClosableSocket>(create: () => S): SocketHub<S> {
  let current: HubEntry<S> | null = null;

  function closeEntry(entry: HubEntry<S>): void {
    if (current === entry) current = null;
    entry.socket.close();
  }

  function acquire(): SocketLease<S> {
    current ??= { socket: create(), users: 0 };
    // Each lease remembers its own entry: a lease taken before a sign-out must not count
    // against (or close) the socket opened after it.
    const entry = current;
    entry.users += 1;
    const teardowns: (() => void)[] = [];
    let released = false;
    return {
      socket: entry.socket,
      onRelease(teardown) {
        if (released) teardown();
        else teardowns.push(teardown);
      },
      release() {
        if (released) return;
        released = true;
        for (const teardown of teardowns.splice(0)) teardown();
        entry.users -= 1;
        if (entry.users === 0 && current === entry) closeEntry(entry);
      },
    };
  }

  function closeShared(): void {
    if (current) closeEntry(current);
  }

  return { acquire, closeShared, users: () => current?.users ?? 0 };
}

/**
 * Counts users per key (here: per run room) so a shared socket leaves a room only when the last
 * user that asked for it is gone; one leaving must not cut off another still watching.
 */
export interface KeyCounter {
  /** Returns true when this is the first user of the key. */
  add(key: string): boolean;
  /** Returns true when this was the last user of the key. */
  remove(key: string): boolean;
}

export function createKeyCounter(): KeyCounter {
  const counts = new Map<string, number>();
  return {
    add(key) {
      const next = (counts.get(key) ?? 0) + 1;
      counts.set(key, next);
      return next === 1;
    },
    remove(key) {
      const now = counts.get(key) ?? 0;
      if (now <= 1) {
        counts.delete(key);
        return now === 1;
      }
      counts.set(key, now - 1);
      return false;
    },
  };
}

interface NotificationServerEvents { [NOTIFICATION_SOCKET_EVENT]: (event: NotificationEvent) => void }
export type AppServerToClientEvents = RunServerToClientEvents & NotificationServerEvents;
export type AppSocket = Socket<AppServerToClientEvents, RunClientToServerEvents>;

const hub = createSocketHub<AppSocket>(() => io({ path: '/socket.io', withCredentials: true, transports: ['websocket', 'polling'] }));

/** A lease on the tab's shared socket; release it when the user unmounts. */
export function acquireSocket(): SocketLease<AppSocket> {
  return hub.acquire();
}

/** Called on sign-out: the next user of the tab must not inherit this session's socket. */
export function closeSharedSocket(): void {
  hub.closeShared();
}

/** The shared socket for a component: released (and this user's handlers dropped) on unmount. */
export function useSharedSocket(): SocketLease<AppSocket> {
  const lease = acquireSocket();
  onBeforeUnmount(() => lease.release());
  return lease;
}
