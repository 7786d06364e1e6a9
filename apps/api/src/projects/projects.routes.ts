import { z } from 'zod';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { description, name, projectParams, uuid } from '../http/common-schemas';
import { addMember, createProject, listMembers, listProjects, removeMember, requireProject, toProjectDto } from './projects.service';

const projectDto = z.object({ id: uuid, name: z.string(), description: z.string(), createdAt: z.string() });
const memberDto = z.object({ userId: uuid, name: z.string(), email: z.string(), role: z.string() });

export function registerProjectRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Projects';
  api
    .add({
      method: 'get', path: '/projects', tag, access: 'user', summary: 'Projects I can see',
      response: z.array(projectDto),
      handler: ({ user }) => listProjects(user),
    })
    .add({
      method: 'post', path: '/projects', tag, access: 'project:create', summary: 'Create a project (I become a member)',
      body: z.object({ name, description }), response: projectDto,
      handler: ({ user, body }) => createProject(ctx.sequelize, user, body),
    })
    .add({
      method: 'get', path: '/projects/:projectId', tag, access: 'user', summary: 'One project',
      params: projectParams, response: projectDto,
      handler: async ({ user, params }) => toProjectDto(await requireProject(user, params.projectId)),
    })
    .add({
      method: 'get', path: '/projects/:projectId/members', tag, access: 'user', summary: 'Members of a project',
      params: projectParams, response: z.array(memberDto),
      handler: async ({ user, params }) => {
        await requireProject(user, params.projectId);
        return listMembers(params.projectId);
      },
    })
    .add({
      method: 'put', path: '/projects/:projectId/members/:userId', tag, access: 'project:manage', summary: 'Add a member',
      params: projectParams.extend({ userId: uuid }),
      handler: async ({ user, params }) => {
        await requireProject(user, params.projectId);
        await addMember(ctx.sequelize, user, params.projectId, params.userId);
      },
    })
    .add({
      method: 'delete', path: '/projects/:projectId/members/:userId', tag, access: 'project:manage', summary: 'Remove a member',
      params: projectParams.extend({ userId: uuid }),
      handler: async ({ user, params }) => {
        await requireProject(user, params.projectId);
        await removeMember(ctx.sequelize, user, params.projectId, params.userId);
      },
    });
}
