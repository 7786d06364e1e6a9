/**
 * What each role may do (product.md, "Who uses it"). Project membership is checked separately:
 * apart from admins, people only see the projects they belong to.
 */
export const ROLES = ['admin', 'analyst', 'reviewer', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  'project:create',
  'project:manage',
  'material:write',
  'material:review',
  'testdata:write',
  'study:write',
  'run:submit',
  'run:cancel',
  'run:review',
  'comment:write',
  'user:manage',
  'queue:manage',
  'audit:read',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const GRANTS: Record<Role, readonly Permission[]> = {
  admin: PERMISSIONS,
  analyst: ['project:create', 'material:write', 'testdata:write', 'study:write', 'run:submit', 'run:cancel', 'comment:write'],
  reviewer: ['material:review', 'run:review', 'comment:write'],
  viewer: [],
};

export function can(role: Role, permission: Permission): boolean {
  return GRANTS[role].includes(permission);
}

export function permissionsOf(role: Role): Permission[] {
  return [...GRANTS[role]];
}
