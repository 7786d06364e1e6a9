import { describe, expect, it } from 'vitest';
import { mayEditMaterials, mayReviewMaterials } from './materialRoles';

// The grants of the API's permission table (docs/architecture.md, "Roles").
describe('material roles', () => {
  it('lets reviewers and admins decide, never analysts or viewers', () => {
    expect(['admin', 'analyst', 'reviewer', 'viewer'].map((r) => mayReviewMaterials(r as 'admin', false))).toEqual([true, false, true, false]);
    expect(mayReviewMaterials(null, true)).toBe(true);
  });

  it('lets analysts and admins write, never reviewers or viewers', () => {
    expect(['admin', 'analyst', 'reviewer', 'viewer'].map((r) => mayEditMaterials(r as 'admin', false))).toEqual([true, true, false, false]);
    expect(mayEditMaterials(null, false)).toBe(false);
  });
});
