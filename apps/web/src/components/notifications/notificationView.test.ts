import { describe, expect, it } from 'vitest';
import type { AppNotification } from '@/api/notifications';
import { mergeNotifications, notificationStatus, notificationTarget } from './notificationView';

const note = (id: string, createdAt: string, read = false): AppNotification => ({
  id, kind: 'run.succeeded', title: `n${id}`, body: '', link: `/runs/${id}`, runId: null, read, createdAt,
});

describe('notification view helpers', () => {
  it('reads the state word from the kind', () => {
    expect(notificationStatus('run.failed')).toBe('failed');
    expect(notificationStatus('run.succeeded')).toBe('succeeded');
  });

  it('follows only paths inside the app', () => {
    expect(notificationTarget({ link: '/runs/abc', runId: null })).toBe('/runs/abc');
    expect(notificationTarget({ link: '//evil.example/x', runId: null })).toBeNull();
    expect(notificationTarget({ link: 'https://evil.example/', runId: 'r1' })).toBe('/runs/r1');
  });

  it('merges pushed and listed notifications newest first without duplicates, the newer copy winning', () => {
    const listed = [note('2', '2026-01-02T00:00:00Z'), note('1', '2026-01-01T00:00:00Z')];
    const merged = mergeNotifications(listed, [note('2', '2026-01-02T00:00:00Z', true), note('3', '2026-01-03T00:00:00Z')]);
    expect(merged.map((n) => [n.id, n.read])).toEqual([['3', false], ['2', true], ['1', false]]);
    expect(mergeNotifications(listed, [], 1).map((n) => n.id)).toEqual(['2']);
  });
});
