/**
 * What each project role may do (product.md, "Who uses it"). Roles belong to a membership, so the
 * same person can be an analyst in one project and a viewer in another. Site admins (users.is_admin)
 * manage users, invitations and the queue, and act as project admins everywhere.
 */
export const ROLES = ['admin', 'analyst', 'reviewer', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  'project:read',
  'project:manage',
  'material:write',
  'material:review',
  'testdata:write',
  'study:write',
  'run:submit',
  'run:cancel',
  'run:review',
  'comment:write',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const ANALYST: readonly Permission[] = ['project:read', 'material:write', 'testdata:write', 'study:write', 'run:submit', 'run:cancel', 'comment:write'];

const GRANTS: Record<Role, readonly Permission[]> = {
  admin: PERMISSIONS,
  analyst: ANALYST,
  reviewer: ['project:read', 'material:review', 'run:review', 'comment:write'],
  viewer: ['project:read'],
};

export function can(role: Role, permission: Permission): boolean {
  return GRANTS[role].includes(permission);
}

export function permissionsOf(role: Role): Permission[] {
  return [...GRANTS[role]];
}
