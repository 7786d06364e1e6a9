/**
 * Which review controls a person sees on a run, mirrored from the API's grants
 * (apps/api/src/auth/permissions.ts): analysts and admins ask for a review, reviewers and admins
 * decide, and everyone but viewers comments. Roles are not a ladder here: an analyst outranks a
 * reviewer elsewhere but may not approve. The API still decides; this only hides what would 403.
 */
import type { ProjectRole } from '@/api/types';
import type { RunReviewStatus } from '@/api/runs';
import type { RunState } from '@phaseloop/shared';

export interface ReviewAccess {
  requestReview: boolean;
  decide: boolean;
  comment: boolean;
}

export function reviewAccess(role: ProjectRole | null | undefined, isSiteAdmin: boolean): ReviewAccess {
  const admin = isSiteAdmin || role === 'admin';
  return {
    requestReview: admin || role === 'analyst',
    decide: admin || role === 'reviewer',
    comment: admin || role === 'analyst' || role === 'reviewer',
  };
}

/** What the review of a run stands at, in words. */
export const REVIEW_STATUS_WORDS: Record<RunReviewStatus, string> = {
  none: 'not requested',
  requested: 'review requested',
  approved: 'approved',
  rejected: 'rejected',
};

/** A review may be asked for a run that succeeded and is not approved (again after a rejection). */
export function mayRequestReview(state: RunState, status: RunReviewStatus): boolean {
  return state === 'succeeded' && (status === 'none' || status === 'rejected');
}

/** A decision is open on a run that succeeded until someone approved or rejected it. */
export function mayDecide(state: RunState, status: RunReviewStatus): boolean {
  return state === 'succeeded' && (status === 'none' || status === 'requested');
}
