import { describe, expect, it } from 'vitest';
import { mayDecide, mayRequestReview, reviewAccess } from './reviewAccess';

describe('review access', () => {
  it('follows the API grants, not the role ladder', () => {
    // apps/api/src/auth/permissions.ts: run:submit (analyst, admin), run:review (reviewer, admin), comment:write (all but viewer).
    expect(reviewAccess('analyst', false)).toEqual({ requestReview: true, decide: false, comment: true });
    expect(reviewAccess('reviewer', false)).toEqual({ requestReview: false, decide: true, comment: true });
    expect(reviewAccess('viewer', false)).toEqual({ requestReview: false, decide: false, comment: false });
    expect(reviewAccess('admin', false)).toEqual({ requestReview: true, decide: true, comment: true });
    expect(reviewAccess(null, true)).toEqual({ requestReview: true, decide: true, comment: true });
    expect(reviewAccess(null, false)).toEqual({ requestReview: false, decide: false, comment: false });
  });

  it('opens a request or a decision only on a run that succeeded and is not decided', () => {
    expect(mayRequestReview('succeeded', 'none')).toBe(true);
    expect(mayRequestReview('succeeded', 'rejected')).toBe(true);
    expect(mayRequestReview('succeeded', 'requested')).toBe(false);
    expect(mayRequestReview('failed', 'none')).toBe(false);
    expect(mayDecide('succeeded', 'requested')).toBe(true);
    expect(mayDecide('succeeded', 'approved')).toBe(false);
    expect(mayDecide('running', 'requested')).toBe(false);
  });
});
