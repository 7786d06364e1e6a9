import { z } from 'zod';
import { QueryTypes } from 'sequelize';
import { RUN_STATES, runDtoSchema, runLogLineSchema, runLogQuerySchema, type RunState } from '@phaseloop/shared';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { idParams, projectParams, uuid } from '../http/common-schemas';
import { requireProject, visibleProjectIds } from '../projects/projects.service';
import { Run, type RunReviewStatus } from './runs.model';
import { cancelRun, deleteRun, listStudyRuns, requestReview, requireRun, rerun, reviewRun, setRunPriority, submitRun, toRunDto } from './runs.service';
import { listArtifacts, listFrames, listIterations, listLogLines, streamArtifact } from './results.service';

export const runDto = runDtoSchema;

export function registerRunRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Runs';
  api
    .add({
      method: 'get', path: '/projects/:projectId/runs', tag, access: 'user', summary: 'Runs of a project, newest first',
      params: projectParams, query: z.object({ limit: z.coerce.number().int().min(1).max(1000).default(200) }),
      response: z.object({
        items: z.array(z.object({
          id: uuid, studyId: uuid, studyName: z.string(), number: z.number().int(), state: z.enum(RUN_STATES),
          queuedAt: z.string().nullable(), startedAt: z.string().nullable(), finishedAt: z.string().nullable(),
          reviewStatus: z.enum(['none', 'requested', 'approved', 'rejected']),
        })),
      }),
      handler: async ({ user, params, query }) => {
        await requireProject(user, params.projectId);
        const rows = await ctx.sequelize.query<{ id: string; studyId: string; studyName: string; number: number; state: RunState; queuedAt: Date | null; startedAt: Date | null; finishedAt: Date | null; reviewStatus: RunReviewStatus }>(
          `SELECT r.id, r.study_id AS "studyId", s.name AS "studyName", r.number, r.state, r.queued_at AS "queuedAt",
                  r.started_at AS "startedAt", r.finished_at AS "finishedAt", r.review_status AS "reviewStatus"
             FROM runs r JOIN studies s ON s.id = r.study_id
            WHERE r.project_id = :projectId ORDER BY r.created_at DESC LIMIT :limit`,
          { replacements: { projectId: params.projectId, limit: query.limit }, type: QueryTypes.SELECT },
        );
        const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
        return { items: rows.map((r) => ({ ...r, queuedAt: iso(r.queuedAt), startedAt: iso(r.startedAt), finishedAt: iso(r.finishedAt) })) };
      },
    })
    .add({
      method: 'post', path: '/studies/:id/runs', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Freeze the study and queue a run',
      params: idParams, response: runDto,
      handler: ({ user, params }) => submitRun(ctx, user, params.id),
    })
    .add({
      method: 'get', path: '/studies/:id/runs', tag, access: 'user', summary: 'Runs of a study, newest first',
      params: idParams, response: z.array(runDto),
      handler: ({ user, params }) => listStudyRuns(ctx.sequelize, user, params.id),
    })
    .add({
      method: 'get', path: '/runs/:id', tag, access: 'user', summary: 'One run, with its frozen snapshot',
      params: idParams, response: runDto,
      handler: async ({ user, params }) => toRunDto(ctx.sequelize, await requireRun(user, params.id), true),
    })
    .add({
      method: 'post', path: '/runs/:id/cancel', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Cancel a queued or running run', status: 200,
      params: idParams, response: runDto,
      handler: ({ user, params }) => cancelRun(ctx, user, params.id),
    })
    .add({
      method: 'post', path: '/runs/:id/priority', tag, access: 'site-admin', summary: 'Move a queued run up (higher priority) or down in the queue', status: 200,
      params: idParams, body: z.object({ priority: z.number().int().min(-100).max(100) }), response: runDto,
      handler: ({ user, params, body }) => setRunPriority(ctx, user, params.id, body.priority),
    })
    .add({
      method: 'delete', path: '/runs/:id', tag, access: 'user', description: 'Project analysts and admins; finished runs only.', summary: 'Delete a run and its stored results', status: 204,
      params: idParams,
      handler: async ({ user, params }) => { await deleteRun(ctx, user, params.id); },
    })
    .add({
      method: 'post', path: '/runs/:id/rerun', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Queue the same snapshot again',
      params: idParams, response: runDto,
      handler: ({ user, params }) => rerun(ctx, user, params.id),
    })
    .add({
      method: 'post', path: '/runs/:id/request-review', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Ask a reviewer to approve a run', status: 200,
      params: idParams, response: runDto,
      handler: ({ user, params }) => requestReview(ctx, user, params.id),
    })
    .add({
      method: 'post', path: '/runs/:id/review', tag, access: 'user', description: 'Project reviewers and admins.', summary: 'Approve or reject a run', status: 200,
      params: idParams, body: z.object({ decision: z.enum(['approve', 'reject']), reason: z.string().max(5000).default('') }), response: runDto,
      handler: ({ user, params, body }) => reviewRun(ctx, user, params.id, body.decision, body.reason),
    })
    .add({
      method: 'get', path: '/runs/:id/iterations', tag, access: 'user', summary: 'Convergence log (page with afterSeq)',
      params: idParams, query: z.object({ afterSeq: z.coerce.number().int().min(-1).default(-1), limit: z.coerce.number().int().min(1).max(10_000).default(1000) }),
      response: z.array(z.object({ seq: z.number(), segment: z.number(), increment: z.number(), iteration: z.number(), time: z.number(), residualNorm: z.number(), correctionNorm: z.number(), cutBacks: z.number() })),
      handler: async ({ user, params, query }) => {
        await requireRun(user, params.id);
        return listIterations(ctx.sequelize, params.id, query.afterSeq, query.limit);
      },
    })
    .add({
      method: 'get', path: '/runs/:id/logs', tag, access: 'user', description: 'Project members (viewers too).',
      summary: 'Stored log lines of a run, oldest first (page with afterSeq; each attempt keeps its first lines)',
      params: idParams, query: runLogQuerySchema, response: z.array(runLogLineSchema),
      handler: async ({ user, params, query }) => {
        await requireRun(user, params.id);
        return listLogLines(ctx.sequelize, params.id, query.afterSeq, query.limit);
      },
    })
    .add({
      method: 'get', path: '/runs/:id/frames', tag, access: 'user', summary: 'Converged frames with their history values',
      params: idParams,
      response: z.array(z.object({ frame: z.number(), segment: z.number(), increment: z.number(), time: z.number(), history: z.record(z.string(), z.number()) })),
      handler: async ({ user, params }) => {
        await requireRun(user, params.id);
        return listFrames(ctx.sequelize, params.id);
      },
    })
    .add({
      method: 'get', path: '/runs/:id/files', tag, access: 'user', summary: 'Result files of a run',
      params: idParams,
      response: z.array(z.object({ id: uuid, name: z.string(), contentType: z.string(), size: z.number(), complete: z.boolean(), createdAt: z.string() })),
      handler: async ({ user, params }) => {
        await requireRun(user, params.id);
        return listArtifacts(ctx.sequelize, params.id);
      },
    })
    .add({
      method: 'get', path: '/runs/:id/files/:name', tag, access: 'user', summary: 'Download one result file', raw: true,
      params: idParams.extend({ name: z.string().min(1).max(300) }),
      handler: async ({ user, params, res }) => {
        await requireRun(user, params.id);
        await streamArtifact(ctx.pool, params.id, params.name, res);
      },
    })
    .add({
      method: 'get', path: '/runs/:id/results/:name', tag, access: 'user', raw: true,
      summary: 'Download a result: result.json, frames.pvd, frame-<k>.vtu or history.csv (streamed)',
      params: idParams.extend({ name: z.string().regex(/^(result\.json|frames\.pvd|history\.csv|frame-\d{1,6}\.vtu)$/, { error: 'name must be result.json, frames.pvd, history.csv or frame-<k>.vtu' }) }),
      handler: async ({ user, params, res }) => {
        await requireRun(user, params.id);
        await streamArtifact(ctx.pool, params.id, params.name, res);
      },
    })
    .add({
      method: 'get', path: '/queue', tag, access: 'user', summary: 'Queued and running runs I can see, and the workers',
      response: z.object({
        runs: z.array(runDto),
        workers: z.array(z.object({ id: z.string(), hostname: z.string(), pid: z.number(), lastSeenAt: z.string(), currentRunId: z.string().nullable() })),
      }),
      handler: async ({ user }) => {
        const ids = await visibleProjectIds(user);
        const where = ids === 'all' ? { state: ['queued', 'running'] } : { state: ['queued', 'running'], projectId: ids };
        const visible = await Run.findAll({ where, order: [['priority', 'DESC'], ['queuedAt', 'ASC']] });
        const workers = await ctx.sequelize.query<{ id: string; hostname: string; pid: number; lastSeenAt: Date; currentRunId: string | null }>(
          `SELECT id, hostname, pid, last_seen_at AS "lastSeenAt", current_run_id AS "currentRunId"
             FROM workers WHERE last_seen_at > now() - interval '2 minutes' ORDER BY id`,
          { type: QueryTypes.SELECT },
        );
        return {
          runs: await Promise.all(visible.map((r) => toRunDto(ctx.sequelize, r))),
          workers: workers.map((w) => ({ ...w, lastSeenAt: new Date(w.lastSeenAt).toISOString() })),
        };
      },
    });
}
