/**
 * What each project role may do, mirrored from product.md so the interface can hide actions a role
 * may not take. The server decides; this only spares users buttons that would answer 403.
 */
import type { ProjectRole } from '@/api/types';

/** Higher rank = wider reading rights (what may be seen, not what may be done). */
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

/**
 * Who may take each action, role by role as the API grants it (apps/api/src/auth/permissions.ts).
 * Not a ranking: a reviewer may approve but not submit, an analyst may submit but not approve.
 */
const ALLOWED: Record<ProjectAction, readonly ProjectRole[]> = {
  'project.read': ['viewer', 'reviewer', 'analyst', 'admin'],
  'review.decide': ['reviewer', 'admin'],
  'material.edit': ['analyst', 'admin'],
  'testData.edit': ['analyst', 'admin'],
  'study.edit': ['analyst', 'admin'],
  'run.submit': ['analyst', 'admin'],
  'project.edit': ['admin'],
  'members.manage': ['admin'],
};

/** Reading rights only: every role reads what the roles below it read. */
export function roleAtLeast(role: ProjectRole | null | undefined, minimum: ProjectRole): boolean {
  return role != null && RANK[role] >= RANK[minimum];
}

/**
 * Whether a project member (or a site admin) may take an action. Site admins may manage any
 * project, as /api/projects/:id/members accepts them too.
 */
export function mayDo(action: ProjectAction, role: ProjectRole | null | undefined, isSiteAdmin = false): boolean {
  if (isSiteAdmin) return true;
  return role != null && ALLOWED[action].includes(role);
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
