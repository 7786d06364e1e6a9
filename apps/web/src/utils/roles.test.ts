import { describe, expect, it } from 'vitest';
import { mayDo, roleAtLeast } from './roles';

// Reference: the role table of product.md ("Who uses it"): admin ⊃ analyst ⊃ reviewer ⊃ viewer for
// reading; analysts create and run; reviewers approve; viewers only read; admins manage members.
describe('project roles', () => {
  it('orders the roles from viewer to admin', () => {
    expect(roleAtLeast('admin', 'analyst')).toBe(true);
    expect(roleAtLeast('analyst', 'reviewer')).toBe(true);
    expect(roleAtLeast('reviewer', 'analyst')).toBe(false);
    expect(roleAtLeast('viewer', 'reviewer')).toBe(false);
    expect(roleAtLeast(null, 'viewer')).toBe(false);
  });

  it('lets only analysts and admins submit runs and edit materials', () => {
    expect(mayDo('run.submit', 'analyst')).toBe(true);
    expect(mayDo('material.edit', 'admin')).toBe(true);
    expect(mayDo('run.submit', 'reviewer')).toBe(false);
    expect(mayDo('material.edit', 'viewer')).toBe(false);
  });

  it('lets reviewers decide reviews, and only project admins manage members', () => {
    expect(mayDo('review.decide', 'reviewer')).toBe(true);
    expect(mayDo('review.decide', 'viewer')).toBe(false);
    // Not a ranking: analysts submit but do not approve (apps/api/src/auth/permissions.ts).
    expect(mayDo('review.decide', 'analyst')).toBe(false);
    expect(mayDo('review.decide', 'admin')).toBe(true);
    expect(mayDo('members.manage', 'analyst')).toBe(false);
    expect(mayDo('members.manage', 'admin')).toBe(true);
  });

  it('gives site admins every project action, as /api/projects/:id/members accepts them (contract)', () => {
    expect(mayDo('members.manage', null, true)).toBe(true);
    expect(mayDo('project.read', null, false)).toBe(false);
  });
});
