/**
 * What each project role may do, mirrored from product.md so the interface can hide actions a role
 * may not take. The server decides; this only spares users buttons that would answer 403.
 */
import type { ProjectRole } from '@/api/types';

/** Higher rank = more rights; each role may do everything the roles below it may. */
const RANK: Record<ProjectRole, number> = { viewer: 0, reviewer: 1, analyst: 2, admin: 3 };

export type ProjectAction =
  | 'project.read'
  | 'project.edit'
  | 'members.manage'
  | 'review.decide'
  | 'material.edit'
  | 'testData.edit'
  | 'study.edit'
  | 'run.submit';

const MINIMUM_ROLE: Record<ProjectAction, ProjectRole> = {
  'project.read': 'viewer',
  'review.decide': 'reviewer',
  'material.edit': 'analyst',
  'testData.edit': 'analyst',
  'study.edit': 'analyst',
  'run.submit': 'analyst',
  'project.edit': 'admin',
  'members.manage': 'admin',
};

export function roleAtLeast(role: ProjectRole | null | undefined, minimum: ProjectRole): boolean {
  return role != null && RANK[role] >= RANK[minimum];
}

/**
 * Whether a project member (or a site admin) may take an action. Site admins may manage any
 * project, as /api/projects/:id/members accepts them too.
 */
export function mayDo(action: ProjectAction, role: ProjectRole | null | undefined, isSiteAdmin = false): boolean {
  if (isSiteAdmin) return true;
  return roleAtLeast(role, MINIMUM_ROLE[action]);
}

export const ROLE_LABELS: Record<ProjectRole, string> = {
  admin: 'Admin',
  analyst: 'Analyst',
  reviewer: 'Reviewer',
  viewer: 'Viewer',
};

export const ROLE_DESCRIPTIONS: Record<ProjectRole, string> = {
  admin: 'everything, plus members and roles',
  analyst: 'creates materials, test data and studies; submits runs',
  reviewer: 'reads everything; approves or rejects',
  viewer: 'reads only',
};
