import { z } from 'zod';
import { materialParamsSchema } from '@phaseloop/shared';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { description, idParams, name, projectParams, uuid } from '../http/common-schemas';
import { addVersion, createMaterial, getMaterial, listMaterialSummaries, requireMaterialVersion, reviewVersion, updateDraft, versionWithNames } from './materials.service';

const provenance = z.record(z.string(), z.unknown()).default({});
const notes = z.string().max(10_000).default('');

export const materialVersionDto = z.object({
  id: uuid, materialId: uuid, version: z.number().int(), status: z.enum(['draft', 'approved', 'rejected']),
  params: z.record(z.string(), z.unknown()), provenance: z.record(z.string(), z.unknown()), notes: z.string(),
  createdAt: z.string(), createdBy: z.string().nullable(), createdByName: z.string().nullable(),
  reviewedBy: z.string().nullable(), reviewedByName: z.string().nullable(), reviewedAt: z.string().nullable(), reviewReason: z.string(),
});
const materialDto = z.object({ id: uuid, projectId: uuid, name: z.string(), description: z.string(), latest: materialVersionDto.nullable() });

export function registerMaterialRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Materials';
  api
    .add({
      method: 'get', path: '/projects/:projectId/materials', tag, access: 'user', summary: 'Materials of a project (their latest version)',
      params: projectParams,
      response: z.object({
        items: z.array(z.object({
          id: uuid, name: z.string(), version: z.number().int(), latestVersionId: uuid.nullable(), status: z.enum(['draft', 'approved', 'rejected']),
          model: z.string(), isDemo: z.boolean(), updatedAt: z.string(), updatedByName: z.string().nullable(),
        })),
      }),
      handler: async ({ user, params }) => ({ items: await listMaterialSummaries(user, params.projectId) }),
    })
    .add({
      method: 'post', path: '/projects/:projectId/materials', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Create a material (version 1, draft)',
      params: projectParams,
      body: z.object({ name, description, params: materialParamsSchema, provenance, notes }),
      response: materialDto,
      handler: ({ user, params, body }) => createMaterial(ctx.sequelize, user, params.projectId, body),
    })
    .add({
      method: 'get', path: '/materials/:id', tag, access: 'user', summary: 'A material with all its versions',
      params: idParams, response: materialDto.extend({ versions: z.array(materialVersionDto) }),
      handler: ({ user, params }) => getMaterial(user, params.id),
    })
    .add({
      method: 'post', path: '/materials/:id/versions', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Save a new draft version',
      params: idParams, body: z.object({ params: materialParamsSchema, provenance, notes }), response: materialVersionDto,
      handler: ({ user, params, body }) => addVersion(ctx.sequelize, user, params.id, body),
    })
    .add({
      method: 'get', path: '/material-versions/:id', tag, access: 'user', summary: 'One material version',
      params: idParams, response: materialVersionDto,
      handler: async ({ user, params }) => versionWithNames((await requireMaterialVersion(user, params.id)).version),
    })
    .add({
      method: 'patch', path: '/material-versions/:id', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Edit a draft version',
      params: idParams,
      body: z.object({ params: materialParamsSchema.optional(), provenance: z.record(z.string(), z.unknown()).optional(), notes: z.string().max(10_000).optional() }),
      response: materialVersionDto,
      handler: ({ user, params, body }) => updateDraft(ctx.sequelize, user, params.id, body),
    })
    .add({
      method: 'post', path: '/material-versions/:id/review', tag, access: 'user', description: 'Project reviewers and admins.', summary: 'Approve or reject a draft version', status: 200,
      params: idParams,
      body: z.object({ decision: z.enum(['approve', 'reject']), reason: z.string().max(5000).default('') }),
      response: materialVersionDto,
      handler: ({ user, params, body }) => reviewVersion(ctx.sequelize, user, params.id, body.decision, body.reason),
    });
}
