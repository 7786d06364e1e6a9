import { z } from 'zod';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { description, idParams, name, projectParams, uuid } from '../http/common-schemas';
import { studyDefinitionEnvelope } from './study-definition';
import { createStudy, deleteStudy, duplicateStudy, listStudySummaries, requireStudy, toStudyDto, updateStudy } from './studies.service';
import { studyListQuerySchema } from '@phaseloop/shared';

const studyDto = z.object({
  id: uuid, projectId: uuid, name: z.string(), description: z.string(), definition: z.record(z.string(), z.unknown()),
  revision: z.number().int(), createdAt: z.string(), updatedAt: z.string(),
});

export function registerStudyRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Studies';
  api
    .add({
      method: 'get', path: '/projects/:projectId/studies', tag, access: 'user', summary: 'Studies of a project (filters: q in name/description, createdBy, template, includeDeleted)',
      params: projectParams, query: studyListQuerySchema,
      response: z.object({
        items: z.array(z.object({
          id: uuid, name: z.string(), template: z.string(), description: z.string(), isDemo: z.boolean(), updatedAt: z.string(),
          createdBy: z.object({ id: uuid, name: z.string() }).nullable(),
        })),
      }),
      handler: async ({ user, params, query }) => ({ items: await listStudySummaries(user, params.projectId, query) }),
    })
    .add({
      method: 'post', path: '/projects/:projectId/studies', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Create a study',
      params: projectParams, body: z.object({ name, description, definition: studyDefinitionEnvelope }), response: studyDto,
      handler: ({ user, params, body }) => createStudy(ctx.sequelize, user, params.projectId, body),
    })
    .add({
      method: 'get', path: '/studies/:id', tag, access: 'user', summary: 'One study',
      params: idParams, response: studyDto,
      handler: async ({ user, params }) => toStudyDto(await requireStudy(user, params.id)),
    })
    .add({
      method: 'patch', path: '/studies/:id', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Edit a study (send the revision you edited)',
      params: idParams,
      body: z.object({ name: name.optional(), description: z.string().max(5000).optional(), definition: studyDefinitionEnvelope.optional(), revision: z.number().int().positive() }),
      response: studyDto,
      handler: ({ user, params, body }) => updateStudy(ctx.sequelize, user, params.id, body),
    })
    .add({
      method: 'post', path: '/studies/:id/duplicate', tag, access: 'user', description: 'Project analysts and admins.', summary: 'Copy a study (to edit and run the copy)',
      params: idParams, body: z.object({ name: name.optional() }), response: studyDto,
      handler: ({ user, params, body }) => duplicateStudy(ctx.sequelize, user, params.id, body.name),
    })
    .add({
      method: 'delete', path: '/studies/:id', tag, access: 'user', description: 'Project analysts and admins. Runs of the study are kept.', summary: 'Delete a study (soft)', status: 204,
      params: idParams,
      handler: async ({ user, params }) => { await deleteStudy(ctx.sequelize, user, params.id); },
    });
}
