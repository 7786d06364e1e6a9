import { Op, QueryTypes, type Sequelize } from 'sequelize';
import { isFinalRunState, type RunDto, type RunState, type RunStatusEvent } from '@phaseloop/shared';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import type { AppContext } from '../context';
import { requireProjectOf } from '../projects/projects.service';
import type { Permission } from '../auth/permissions';
import { audit } from '../audit/audit.service';
import { User } from '../users/users.model';
import { Material, MaterialVersion } from '../materials/materials.model';
import { Study } from '../studies/studies.model';
import { requireStudy, validateDefinition } from '../studies/studies.service';
import { nodeCountOf, studyDefinitionEnvelope } from '../studies/study-definition';
import { solverCommit } from '../version';
import { deleteStoredResults } from './results.service';
import { Run, type RunReviewStatus, type RunSnapshot } from './runs.model';
import { notifyUsers } from '../notifications/notifications.service';

export type { RunDto } from '@phaseloop/shared';

const iso = (d: Date | null | undefined): string | null => (d ? d.toISOString() : null);

/** 1 = next to be picked up. Higher priority first (set by admins), then first come, first served. */
export async function queuePosition(sequelize: Sequelize, run: Run): Promise<number | null> {
  if (run.state !== 'queued' || !run.queuedAt) return null;
  const [row] = await sequelize.query<{ n: number }>(
    `SELECT count(*) AS n FROM runs WHERE state = 'queued'
        AND (priority > :priority OR (priority = :priority AND (queued_at, id) <= (:queuedAt, :id)))`,
    { replacements: { queuedAt: run.queuedAt, id: run.id, priority: run.priority ?? 0 }, type: QueryTypes.SELECT },
  );
  return Number(row.n);
}

export async function toRunDto(sequelize: Sequelize, run: Run, withSnapshot = false): Promise<RunDto> {
  return {
    id: run.id, projectId: run.projectId, studyId: run.studyId, sweepId: run.sweepId, number: run.number,
    state: run.state, message: run.message, solverVersion: run.solverVersion, progress: run.progress,
    queuePosition: await queuePosition(sequelize, run), submittedBy: run.submittedBy,
    createdAt: run.createdAt.toISOString(), queuedAt: iso(run.queuedAt), startedAt: iso(run.startedAt),
    finishedAt: iso(run.finishedAt), cancelRequested: run.cancelRequestedAt !== null, cancelledBy: run.cancelledBy ?? null,
    attempts: run.attempts ?? 0, priority: run.priority ?? 0, reviewStatus: run.reviewStatus,
    reviewReason: run.reviewReason, reviewedBy: run.reviewedBy ?? null, reviewedAt: iso(run.reviewedAt ?? null), ...(withSnapshot ? { snapshot: run.snapshot as unknown as Record<string, unknown> } : {}),
  };
}

export async function requireRun(user: SessionUser, id: string, permission: Permission = 'project:read'): Promise<Run> {
  const run = await Run.findByPk(id);
  if (!run) throw notFound('Run');
  await requireProjectOf(user, run.projectId, permission, 'Run');
  return run;
}

/** Runs a user may have queued at once, per run they may have running at once. */
export const QUEUED_PER_ACTIVE_RUN = 25;

/**
 * Quotas set by an admin per user: model size (nodes) and how many runs may wait in the queue.
 * The number of runs solved at once (maxActiveRuns) is enforced by the workers at pick-up, so
 * extra runs simply stay queued.
 */
async function checkQuota(user: SessionUser, nodes: number | undefined): Promise<void> {
  const account = await User.findByPk(user.id);
  if (!account) throw new HttpError(401, 'Please sign in');
  if (nodes !== undefined && nodes > account.maxNodes) {
    throw new HttpError(429, `The model has ${nodes} nodes, over your model-size limit of ${account.maxNodes} nodes (maxNodes). Coarsen the mesh or ask an admin to raise the limit.`, 'rate_limited', { reason: 'quota', limit: 'maxNodes', value: nodes, max: account.maxNodes });
  }
  const cap = account.maxActiveRuns * QUEUED_PER_ACTIVE_RUN;
  const active = await Run.count({ where: { submittedBy: user.id, state: { [Op.in]: ['queued', 'running'] } } });
  if (active >= cap) {
    throw new HttpError(429, `You already have ${active} runs queued or running, your limit of queued runs is ${cap} (maxQueuedRuns = ${QUEUED_PER_ACTIVE_RUN} × maxActiveRuns); wait for some to finish or cancel some.`, 'rate_limited', { reason: 'quota', limit: 'maxQueuedRuns', value: active, max: cap });
  }
}

async function buildSnapshot(study: Study, solverVersion: string): Promise<RunSnapshot> {
  const parsed = studyDefinitionEnvelope.safeParse(study.definition);
  if (!parsed.success) throw new HttpError(422, 'The study is not complete: ' + parsed.error.issues.map((i) => `${['definition', ...i.path].join('.')}: ${i.message}`).join('; '), 'validation_failed', parsed.error.issues.map((i) => ({ path: ['definition', ...i.path].join('.'), message: i.message })));
  const versions = await validateDefinition(study.projectId, parsed.data);
  const materials = await Material.findAll({ where: { id: { [Op.in]: versions.map((v) => v.materialId) } } });
  const nameOf = new Map(materials.map((m) => [m.id, m.name]));
  const [name, version] = solverVersion.split(' ');
  return {
    study: { id: study.id, name: study.name, revision: study.revision, definition: parsed.data },
    materials: versions.map((v: MaterialVersion) => ({
      versionId: v.id, materialId: v.materialId, name: nameOf.get(v.materialId) ?? '', version: v.version, status: v.status, params: v.params,
    })),
    solverVersion,
    solver: { name: name ?? 'fe-core', version: version ?? '', commit: solverCommit() },
    submittedAt: new Date().toISOString(),
  };
}

async function insertAndQueue(ctx: AppContext, user: SessionUser, study: Study, snapshot: RunSnapshot, sweepId: string | null): Promise<Run> {
  const run = await ctx.sequelize.transaction(async (transaction) => {
    // The study row lock serialises run numbering per study.
    await Study.findByPk(study.id, { transaction, lock: transaction.LOCK.UPDATE });
    const last = await Run.max<number, Run>('number', { where: { studyId: study.id }, transaction });
    return Run.create(
      {
        projectId: study.projectId, studyId: study.id, sweepId, number: (last ?? 0) + 1, state: 'queued', snapshot,
        solverVersion: snapshot.solverVersion, submittedBy: user.id, queuedAt: new Date(),
      },
      { transaction },
    );
  });
  try {
    const jobId = await ctx.queue.enqueue(run.id, run.priority ?? 0);
    await run.update({ jobId });
  } catch (err) {
    ctx.logger.error({ err, runId: run.id }, 'enqueue failed');
    await run.update({ state: 'failed', finishedAt: new Date(), message: 'The run could not be queued (queue unavailable); submit it again.' });
  }
  await audit(ctx.sequelize, { userId: user.id, projectId: run.projectId, action: 'run.submit', targetType: 'run', targetId: run.id, detail: { study: study.id, number: run.number } });
  await publishStatus(ctx, run);
  return run;
}

export async function publishStatus(ctx: AppContext, run: Run): Promise<void> {
  const event: RunStatusEvent = { runId: run.id, state: run.state, message: run.message, at: new Date().toISOString() };
  const pos = await queuePosition(ctx.sequelize, run);
  if (pos !== null) event.queuePosition = pos;
  ctx.broadcaster.status(event);
}

export async function submitRun(ctx: AppContext, user: SessionUser, studyId: string): Promise<RunDto> {
  const study = await requireStudy(user, studyId, 'run:submit');
  const snapshot = await buildSnapshot(study, ctx.solverVersion);
  await checkQuota(user, nodeCountOf(snapshot.study.definition));
  return toRunDto(ctx.sequelize, await insertAndQueue(ctx, user, study, snapshot, null));
}

/** Same frozen snapshot, new run (the solver version is today's). */
export async function rerun(ctx: AppContext, user: SessionUser, runId: string): Promise<RunDto> {
  const previous = await requireRun(user, runId, 'run:submit');
  const study = await Study.findByPk(previous.studyId);
  if (!study) throw notFound('Study');
  await checkQuota(user, nodeCountOf(previous.snapshot.study.definition));
  const snapshot: RunSnapshot = {
    ...previous.snapshot, solverVersion: ctx.solverVersion, submittedAt: new Date().toISOString(),
    solver: { ...(previous.snapshot.solver ?? { name: 'fe-core', version: '' }), commit: solverCommit() },
  };
  return toRunDto(ctx.sequelize, await insertAndQueue(ctx, user, study, snapshot, previous.sweepId));
}

/**
 * A queued run is cancelled at once. A running one gets a cancel request that the worker checks
 * between iterations (pg-boss's own cancel only changes its job row; it cannot stop a handler).
 */
export async function cancelRun(ctx: AppContext, user: SessionUser, runId: string): Promise<RunDto> {
  const run = await requireRun(user, runId, 'run:cancel');
  if (isFinalRunState(run.state)) throw new HttpError(409, `The run has already ${run.state === 'cancelled' ? 'been cancelled' : run.state}`);
  const [cancelledQueued] = await Run.update(
    { state: 'cancelled', cancelRequestedAt: new Date(), cancelledBy: user.id, finishedAt: new Date(), message: `Cancelled by ${user.name} before it started` },
    { where: { id: run.id, state: 'queued' } },
  );
  if (cancelledQueued === 1) {
    if (run.jobId) await ctx.queue.cancel(run.jobId).catch((err: unknown) => ctx.logger.warn({ err, runId }, 'job cancel failed'));
  } else {
    await Run.update(
      { cancelRequestedAt: new Date(), cancelledBy: user.id, message: `Cancel requested by ${user.name}` },
      { where: { id: run.id, state: 'running', cancelRequestedAt: null } },
    );
  }
  await run.reload();
  await audit(ctx.sequelize, { userId: user.id, projectId: run.projectId, action: 'run.cancel', targetType: 'run', targetId: run.id, detail: { state: run.state } });
  await publishStatus(ctx, run);
  return toRunDto(ctx.sequelize, run);
}

export async function listStudyRuns(sequelize: Sequelize, user: SessionUser, studyId: string): Promise<RunDto[]> {
  await requireStudy(user, studyId);
  const runs = await Run.findAll({ where: { studyId }, order: [['number', 'DESC']] });
  return Promise.all(runs.map((r) => toRunDto(sequelize, r)));
}

export async function requestReview(ctx: AppContext, user: SessionUser, runId: string): Promise<RunDto> {
  const run = await requireRun(user, runId, 'run:submit');
  if (run.state !== 'succeeded') throw new HttpError(409, 'Only a run that succeeded can be reviewed');
  if (run.reviewStatus === 'approved') throw new HttpError(409, 'The run is already approved');
  await run.update({ reviewStatus: 'requested' });
  await audit(ctx.sequelize, { userId: user.id, projectId: run.projectId, action: 'run.review-request', targetType: 'run', targetId: run.id });
  const { rows } = await ctx.pool.query<{ user_id: string }>(
    "SELECT user_id FROM project_members WHERE project_id = $1 AND role IN ('reviewer', 'admin') AND user_id <> $2",
    [run.projectId, user.id],
  );
  await notifyUsers(ctx, rows.map((r) => r.user_id), {
    kind: 'review.requested', title: `Review requested: run ${run.number} of "${run.snapshot.study.name}"`,
    body: `${user.name} asks for a review of this run.`, link: `/runs/${run.id}`, runId: run.id,
  });
  return toRunDto(ctx.sequelize, run);
}

export async function reviewRun(ctx: AppContext, user: SessionUser, runId: string, decision: 'approve' | 'reject', reason: string): Promise<RunDto> {
  const run = await requireRun(user, runId, 'run:review');
  if (run.state !== 'succeeded') throw new HttpError(409, 'Only a run that succeeded can be reviewed');
  if (run.reviewStatus === 'approved' || run.reviewStatus === 'rejected') throw new HttpError(409, `The run has already been ${run.reviewStatus}`);
  if (decision === 'reject' && !reason.trim()) throw new HttpError(422, 'Say why the run is rejected', 'validation_failed');
  if (decision === 'approve') {
    const ids = run.snapshot.materials.map((m) => m.versionId);
    const approved = await MaterialVersion.count({ where: { id: { [Op.in]: ids }, status: 'approved' } });
    if (approved !== ids.length) {
      throw new HttpError(409, 'Every material version the run used must be approved before the run can be', 'conflict');
    }
  }
  await run.update({ reviewStatus: decision === 'approve' ? 'approved' : 'rejected', reviewedBy: user.id, reviewedAt: new Date(), reviewReason: reason });
  await audit(ctx.sequelize, { userId: user.id, projectId: run.projectId, action: `run.${decision}`, targetType: 'run', targetId: run.id, detail: { reason } });
  if (run.submittedBy && run.submittedBy !== user.id) {
    const word = decision === 'approve' ? 'approved' : 'rejected';
    await notifyUsers(ctx, [run.submittedBy], {
      kind: `review.${word}`, title: `Run ${run.number} of "${run.snapshot.study.name}" ${word}`,
      body: reason ? `${user.name}: ${reason}` : `${word} by ${user.name}`, link: `/runs/${run.id}`, runId: run.id,
    });
  }
  return toRunDto(ctx.sequelize, run);
}

/**
 * Admins move a queued run up or down. pg-boss cannot re-prioritise a waiting job, so the old job
 * is cancelled and the run queued again with the new priority (a worker that already fetched the
 * old job finds the run claimed or drops the job).
 */
export async function setRunPriority(ctx: AppContext, user: SessionUser, runId: string, priority: number): Promise<RunDto> {
  const run = await Run.findByPk(runId);
  if (!run) throw notFound('Run');
  if (run.state !== 'queued') throw new HttpError(409, 'Only a queued run can be moved in the queue');
  const oldJob = run.jobId;
  await run.update({ priority });
  const jobId = await ctx.queue.enqueue(run.id, priority);
  await run.update({ jobId });
  if (oldJob) await ctx.queue.cancel(oldJob).catch((err: unknown) => ctx.logger.warn({ err, runId }, 'old job cancel failed'));
  await audit(ctx.sequelize, { userId: user.id, projectId: run.projectId, action: 'run.priority', targetType: 'run', targetId: run.id, detail: { priority } });
  await publishStatus(ctx, run);
  return toRunDto(ctx.sequelize, run);
}

/** Deletes a finished run with everything stored for it (rows, chunks, objects in S3). */
export async function deleteRun(ctx: AppContext, user: SessionUser, runId: string): Promise<void> {
  const run = await requireRun(user, runId, 'run:submit');
  if (!isFinalRunState(run.state)) throw new HttpError(409, 'Cancel the run before deleting it');
  await deleteStoredResults(ctx, run.id);
  await run.destroy();
  await audit(ctx.sequelize, { userId: user.id, projectId: run.projectId, action: 'run.delete', targetType: 'run', targetId: run.id, detail: { number: run.number } });
}
