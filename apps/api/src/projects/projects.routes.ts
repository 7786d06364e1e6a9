import { z } from 'zod';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { description, name, projectParams, uuid } from '../http/common-schemas';
import { ROLES } from '../auth/permissions';
import { createProject, listMembers, listProjects, removeMember, requireProject, setMemberRole, toProjectDto, updateProject } from './projects.service';

export const projectDto = z.object({
  id: uuid, name: z.string(), description: z.string(), role: z.enum(ROLES).nullable(), memberCount: z.number().int(), isDemo: z.boolean(),
});
const memberDto = z.object({ userId: uuid, name: z.string(), email: z.string(), role: z.enum(ROLES) });

export function registerProjectRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Projects';
  api
    .add({
      method: 'get', path: '/projects', tag, access: 'user', summary: 'Projects I belong to (site admins: all)',
      response: z.object({ items: z.array(projectDto) }),
      handler: async ({ user }) => ({ items: await listProjects(ctx.sequelize, user) }),
    })
    .add({
      method: 'post', path: '/projects', tag, access: 'site-admin', summary: 'Create a project (I become its admin)',
      body: z.object({ name, description }), response: projectDto,
      handler: ({ user, body }) => createProject(ctx.sequelize, user, body),
    })
    .add({
      method: 'get', path: '/projects/:projectId', tag, access: 'user', summary: 'One project with my role in it',
      params: projectParams, response: projectDto,
      handler: async ({ user, params }) => {
        const { project, memberRole } = await requireProject(user, params.projectId);
        return toProjectDto(ctx.sequelize, project, memberRole);
      },
    })
    .add({
      method: 'patch', path: '/projects/:projectId', tag, access: 'user', description: 'Project admins.', summary: 'Rename or describe a project',
      params: projectParams, body: z.object({ name: name.optional(), description: z.string().max(5000).optional() }), response: projectDto,
      handler: ({ user, params, body }) => updateProject(ctx.sequelize, user, params.projectId, body),
    })
    .add({
      method: 'get', path: '/projects/:projectId/members', tag, access: 'user', summary: 'Members of a project',
      params: projectParams, response: z.object({ items: z.array(memberDto) }),
      handler: async ({ user, params }) => {
        await requireProject(user, params.projectId);
        return { items: await listMembers(params.projectId) };
      },
    })
    .add({
      method: 'put', path: '/projects/:projectId/members/:userId', tag, access: 'user', description: 'Project admins.', summary: 'Add a member or change their role',
      params: projectParams.extend({ userId: uuid }), body: z.object({ role: z.enum(ROLES) }), response: memberDto, status: 200,
      handler: ({ user, params, body }) => setMemberRole(ctx.sequelize, user, params.projectId, params.userId, body.role),
    })
    .add({
      method: 'delete', path: '/projects/:projectId/members/:userId', tag, access: 'user', description: 'Project admins.', summary: 'Remove a member',
      params: projectParams.extend({ userId: uuid }), status: 204,
      handler: ({ user, params }) => removeMember(ctx.sequelize, user, params.projectId, params.userId),
    });
}
