import { z } from 'zod';
import { QueryTypes } from 'sequelize';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import type { SessionUser } from '../auth/session-user';
import type { Permission } from '../auth/permissions';
import { uuid } from '../http/common-schemas';
import { audit } from '../audit/audit.service';
import { requireMaterialVersion } from '../materials/materials.service';
import { requireStudy } from '../studies/studies.service';
import { requireRun } from '../runs/runs.service';

const TARGETS = ['material-version', 'study', 'run'] as const;
type Target = (typeof TARGETS)[number];

/** The project of a comment's target, after checking the user may see the target. */
async function projectOfTarget(user: SessionUser, type: Target, id: string, permission: Permission): Promise<string> {
  switch (type) {
    case 'material-version': return (await requireMaterialVersion(user, id, permission)).material.projectId;
    case 'study': return (await requireStudy(user, id, permission)).projectId;
    case 'run': return (await requireRun(user, id, permission)).projectId;
  }
}

const commentDto = z.object({ id: uuid, targetType: z.enum(TARGETS), targetId: uuid, authorId: z.string().nullable(), authorName: z.string().nullable(), body: z.string(), createdAt: z.string() });

export function registerCommentRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Review';
  const target = z.object({ targetType: z.enum(TARGETS), targetId: uuid });
  api
    .add({
      method: 'get', path: '/comments', tag, access: 'user', summary: 'Comments on a material version, study or run',
      query: target, response: z.array(commentDto),
      handler: async ({ user, query }) => {
        await projectOfTarget(user, query.targetType, query.targetId, 'project:read');
        const rows = await ctx.sequelize.query<z.infer<typeof commentDto> & { createdAt: Date }>(
          `SELECT c.id, c.target_type AS "targetType", c.target_id AS "targetId", c.author_id AS "authorId", u.name AS "authorName", c.body, c.created_at AS "createdAt"
             FROM comments c LEFT JOIN users u ON u.id = c.author_id
            WHERE c.target_type = :targetType AND c.target_id = :targetId ORDER BY c.created_at`,
          { replacements: query, type: QueryTypes.SELECT },
        );
        return rows.map((r) => ({ ...r, createdAt: new Date(r.createdAt).toISOString() }));
      },
    })
    .add({
      method: 'post', path: '/comments', tag, access: 'user', description: 'Project analysts, reviewers and admins.', summary: 'Comment on a material version, study or run',
      body: target.extend({ body: z.string().trim().min(1, { error: 'Write something' }).max(10_000) }), response: commentDto,
      handler: async ({ user, body }) => {
        const projectId = await projectOfTarget(user, body.targetType, body.targetId, 'comment:write');
        const [row] = await ctx.sequelize.query<{ id: string; createdAt: Date }>(
          `INSERT INTO comments (project_id, target_type, target_id, author_id, body) VALUES (:projectId, :targetType, :targetId, :authorId, :body)
           RETURNING id, created_at AS "createdAt"`,
          { replacements: { projectId, ...body, authorId: user.id }, type: QueryTypes.SELECT },
        );
        await audit(ctx.sequelize, { userId: user.id, projectId, action: 'comment.add', targetType: body.targetType, targetId: body.targetId });
        return { id: row.id, targetType: body.targetType, targetId: body.targetId, authorId: user.id, authorName: user.name, body: body.body, createdAt: new Date(row.createdAt).toISOString() };
      },
    });
}
