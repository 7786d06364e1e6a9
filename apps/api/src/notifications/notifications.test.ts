/**
 * The end of a run is announced once: an in-app notification pushed with the unread count, and
 * an e-mail with a link to the run (through the fake SMTP server) unless the user opted out.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { NotificationEvent } from '@phaseloop/shared';
import { createTestApp, type TestApp } from '../testing/test-app';
import type { RunBroadcaster } from '../realtime/broadcaster';
import { Study } from '../studies/studies.model';
import { Run } from '../runs/runs.model';
import { announceFinishedRuns } from './notifications.service';

const pushed: { userId: string; event: NotificationEvent }[] = [];
const broadcaster: RunBroadcaster = { status: () => undefined, notification: (userId, event) => pushed.push({ userId, event }) };
let t: TestApp;

beforeAll(async () => {
  t = await createTestApp({ broadcaster });
});
afterAll(async () => {
  await t?.close();
});

async function endedRun(projectId: string, userId: string, state: 'succeeded' | 'failed', message: string): Promise<Run> {
  const study = await Study.create({ projectId, name: 'Wire under load', definition: { materials: [] }, createdBy: null });
  return Run.create({
    projectId, studyId: study.id, sweepId: null, number: 1, state, message, solverVersion: 'test', submittedBy: userId, queuedAt: new Date(), finishedAt: new Date(),
    snapshot: { study: { id: study.id, name: study.name, revision: 1, definition: { materials: [] } }, materials: [], solverVersion: 'test', submittedAt: new Date().toISOString() },
  });
}

describe('run notifications', () => {
  it('notifies the submitter once, in the app and by e-mail with a link; opt-out stops the mail only', async () => {
    const project = await t.createProject();
    const { client, user } = await t.signIn({ project, role: 'analyst' });
    const failed = await endedRun(project.id, user.id, 'failed', 'Segment "load" did not converge at t = 0.42 s');

    expect(await announceFinishedRuns(t.ctx)).toBe(1);
    expect(await announceFinishedRuns(t.ctx)).toBe(0);
    const mail = await t.mailTo(user.email);
    expect(mail.subject).toContain('failed');
    expect(mail.text).toContain(`${t.config.APP_URL}/runs/${failed.id}`);
    expect(mail.text).toContain('did not converge at t = 0.42 s');
    expect(pushed.at(-1)).toMatchObject({ userId: user.id, event: { unread: 1, notification: { runId: failed.id, kind: 'run.failed', read: false } } });

    const list = (await client.get('/api/notifications').expect(200)).body;
    expect(list.unread).toBe(1);
    expect(list.items[0]).toMatchObject({ runId: failed.id, link: `/runs/${failed.id}` });
    expect((await client.post('/api/notifications/read').send({ ids: [list.items[0].id] }).expect(200)).body).toEqual({ unread: 0 });

    expect((await client.put('/api/notifications/settings').send({ emailOnRunEnd: false }).expect(200)).body).toEqual({ emailOnRunEnd: false });
    const mailsBefore = await t.ctx.pool.query('SELECT count(*)::int AS n FROM captured_mail WHERE $1 = ANY(to_addresses)', [user.email]);
    const ok = await endedRun(project.id, user.id, 'succeeded', 'Converged');
    expect(await announceFinishedRuns(t.ctx)).toBe(1);
    expect(pushed.at(-1)).toMatchObject({ userId: user.id, event: { unread: 1, notification: { runId: ok.id, kind: 'run.succeeded' } } });
    await new Promise((r) => setTimeout(r, 300));
    const mailsAfter = await t.ctx.pool.query('SELECT count(*)::int AS n FROM captured_mail WHERE $1 = ANY(to_addresses)', [user.email]);
    expect(mailsAfter.rows[0].n).toBe(mailsBefore.rows[0].n);
  });

  it('tells the project reviewers when a review is asked for, and the submitter how it was decided', async () => {
    const project = await t.createProject();
    const analyst = await t.signIn({ project, role: 'analyst' });
    const reviewer = await t.signIn({ project, role: 'reviewer' });
    const viewer = await t.signIn({ project, role: 'viewer' });
    const run = await endedRun(project.id, analyst.user.id, 'succeeded', 'Converged');
    await announceFinishedRuns(t.ctx);

    await analyst.client.post(`/api/runs/${run.id}/request-review`).expect(200);
    const asked = (await reviewer.client.get('/api/notifications').expect(200)).body;
    expect(asked.items[0]).toMatchObject({ kind: 'review.requested', runId: run.id, link: `/runs/${run.id}`, read: false });
    expect(asked.items[0].title).toContain('Review requested: run 1 of "Wire under load"');
    // Viewers do not review, and the one who asked is not told about their own request.
    expect((await viewer.client.get('/api/notifications').expect(200)).body.items).toEqual([]);
    expect((await analyst.client.get('/api/notifications').expect(200)).body.items.map((n: { kind: string }) => n.kind)).toEqual(['run.succeeded']);

    await reviewer.client.post(`/api/runs/${run.id}/review`).send({ decision: 'reject', reason: 'mesh too coarse at the strut crown' }).expect(200);
    const decided = (await analyst.client.get('/api/notifications').expect(200)).body;
    expect(decided.items[0]).toMatchObject({ kind: 'review.rejected', runId: run.id, read: false });
    expect(decided.items[0].body).toContain('mesh too coarse at the strut crown');
    expect(pushed.at(-1)).toMatchObject({ userId: analyst.user.id, event: { notification: { kind: 'review.rejected' } } });
    // The run answer names who decided and when (the printable report shows them).
    const decidedRun = (await analyst.client.get(`/api/runs/${run.id}`).expect(200)).body;
    expect(decidedRun).toMatchObject({ reviewStatus: 'rejected', reviewedBy: reviewer.user.id, reviewReason: 'mesh too coarse at the strut crown' });
    expect(Number.isNaN(Date.parse(decidedRun.reviewedAt))).toBe(false);
  });
});
