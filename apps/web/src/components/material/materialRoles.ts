/**
 * Who may act on the material library, as the API's permissions grant it (auth/permissions.ts):
 * analysts and admins write materials; reviewers and admins decide on drafts. Analysts rank above
 * reviewers in utils/roles.ts, but they may not review, so review rights are checked by name here.
 */
import type { ProjectRole } from '@/api/types';

export function mayEditMaterials(role: ProjectRole | null | undefined, isSiteAdmin: boolean): boolean {
  return isSiteAdmin || role === 'analyst' || role === 'admin';
}

export function mayReviewMaterials(role: ProjectRole | null | undefined, isSiteAdmin: boolean): boolean {
  return isSiteAdmin || role === 'reviewer' || role === 'admin';
}
