import { describe, expect, it } from 'vitest';
import { createKeyCounter, createSocketHub, type ClosableSocket } from './useSocket';

/** Stands in for a Socket.IO socket: records closes and the listeners currently attached. */
class FakeSocket implements ClosableSocket {
  connected = true;
  closes = 0;
  readonly listeners = new Map<string, Set<() => void>>();
  constructor(readonly id: number) {}
  close(): void {
    this.closes += 1;
    this.connected = false;
  }
  on(event: string, handler: () => void): void {
    const set = this.listeners.get(event) ?? new Set<() => void>();
    set.add(handler);
    this.listeners.set(event, set);
  }
  off(event: string, handler: () => void): void {
    this.listeners.get(event)?.delete(handler);
  }
  count(event: string): number {
    return this.listeners.get(event)?.size ?? 0;
  }
}

function fakeHub(): { hub: ReturnType<typeof createSocketHub<FakeSocket>>; created: FakeSocket[] } {
  const created: FakeSocket[] = [];
  const hub = createSocketHub(() => {
    const socket = new FakeSocket(created.length + 1);
    created.push(socket);
    return socket;
  });
  return { hub, created };
}

describe('createSocketHub', () => {
  it('opens no socket until someone asks for one', () => {
    const { hub, created } = fakeHub();
    expect(created).toHaveLength(0);
    expect(hub.users()).toBe(0);
    hub.acquire();
    expect(created).toHaveLength(1);
  });

  it('hands the same socket to every user and counts them', () => {
    const { hub, created } = fakeHub();
    const bell = hub.acquire();
    const runStream = hub.acquire();
    expect(runStream.socket).toBe(bell.socket);
    expect(created).toHaveLength(1);
    expect(hub.users()).toBe(2);
  });

  it('closes the socket only when the last user releases it', () => {
    const { hub, created } = fakeHub();
    const bell = hub.acquire();
    const runStream = hub.acquire();
    runStream.release();
    expect(created[0].closes).toBe(0);
    expect(hub.users()).toBe(1);
    bell.release();
    expect(created[0].closes).toBe(1);
    expect(hub.users()).toBe(0);
  });

  it('ignores a second release of the same lease', () => {
    const { hub, created } = fakeHub();
    const bell = hub.acquire();
    const runStream = hub.acquire();
    runStream.release();
    runStream.release();
    expect(hub.users()).toBe(1);
    expect(created[0].closes).toBe(0);
    bell.release();
  });

  it("removes only the releasing user's listeners", () => {
    const { hub } = fakeHub();
    const bell = hub.acquire();
    const runStream = hub.acquire();
    const bellConnect = (): void => undefined;
    const runConnect = (): void => undefined;
    bell.socket.on('connect', bellConnect);
    bell.onRelease(() => bell.socket.off('connect', bellConnect));
    runStream.socket.on('connect', runConnect);
    runStream.onRelease(() => runStream.socket.off('connect', runConnect));
    expect(bell.socket.count('connect')).toBe(2);
    runStream.release();
    expect(bell.socket.count('connect')).toBe(1);
    expect(bell.socket.listeners.get('connect')?.has(bellConnect)).toBe(true);
  });

  it('runs cleanup registered after release at once', () => {
    const { hub } = fakeHub();
    const lease = hub.acquire();
    lease.release();
    let ran = false;
    lease.onRelease(() => { ran = true; });
    expect(ran).toBe(true);
  });

  it('opens a new socket after the last user left', () => {
    const { hub, created } = fakeHub();
    hub.acquire().release();
    const next = hub.acquire();
    expect(created).toHaveLength(2);
    expect(next.socket.id).toBe(2);
  });

  it('closes the socket on sign-out even while it is in use, and a later lease gets a fresh one', () => {
    const { hub, created } = fakeHub();
    const oldBell = hub.acquire();
    hub.closeShared();
    expect(created[0].closes).toBe(1);
    expect(hub.users()).toBe(0);
    const newBell = hub.acquire();
    expect(newBell.socket).not.toBe(oldBell.socket);
    // The old page unmounting late must neither close nor uncount the new session's socket.
    oldBell.release();
    expect(hub.users()).toBe(1);
    expect(created[1].closes).toBe(0);
    expect(created[0].closes).toBe(1);
  });

  it('does nothing on sign-out when no socket is open', () => {
    const { hub, created } = fakeHub();
    hub.closeShared();
    expect(created).toHaveLength(0);
  });
});

describe('createKeyCounter', () => {
  it('reports the first and the last user of a key', () => {
    const rooms = createKeyCounter();
    expect(rooms.add('run-a')).toBe(true);
    expect(rooms.add('run-a')).toBe(false);
    expect(rooms.add('run-b')).toBe(true);
    expect(rooms.remove('run-a')).toBe(false);
    expect(rooms.remove('run-a')).toBe(true);
    expect(rooms.remove('run-b')).toBe(true);
  });

  it('does not report a key that was never added as last', () => {
    const rooms = createKeyCounter();
    expect(rooms.remove('run-a')).toBe(false);
    expect(rooms.add('run-a')).toBe(true);
  });
});
