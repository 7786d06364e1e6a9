import { describe, expect, it } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { buildProblem } from '../assembly/problem';
import { rectangle } from '../mesh/structured';
import { freeRigidBodyMotions } from './rigidBody';

function problem(supports: ModelInput['supports'], analysis: 'planeStress' | 'axisymmetric' = 'planeStress') {
  const mesh = rectangle({ x0: 2, width: 4, height: 2, nx: 2, ny: 1 }, { type: 'q4', section: 's', material: 'm' });
  const parsed = parseModel({
    format: 'phaseloop-model/1',
    ...mesh,
    nodeSets: { ...mesh.nodeSets, corner: [1] },
    sections: { s: { kind: 'continuum', analysis, thickness: 1 } },
    materials: { m: { model: 'linear-elastic', E: 1, nu: 0.3 } },
    supports,
    segments: [{ name: 'a' }],
  });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return buildProblem(parsed.model);
}

describe('free rigid-body motions', () => {
  it('no supports: both translations and the rotation are free', () => {
    expect(freeRigidBodyMotions(problem([])).free).toHaveLength(3);
  });
  it('one pinned node: only the rotation about that node is free', () => {
    const { free } = freeRigidBodyMotions(problem([{ type: 'fixed', set: 'corner' }]));
    expect(free).toEqual(['rotation in the plane about (2.000, 0.000)']);
  });
  it('a clamped edge: nothing is free', () => {
    expect(freeRigidBodyMotions(problem([{ type: 'fixed', set: 'left' }])).free).toEqual([]);
  });
  it('axisymmetric: only the axial translation counts', () => {
    expect(freeRigidBodyMotions(problem([], 'axisymmetric')).free).toEqual(['translation along the axis (z)']);
    expect(freeRigidBodyMotions(problem([{ type: 'fixed', set: 'bottom', dofs: ['uy'] }], 'axisymmetric')).free).toEqual([]);
  });
});
