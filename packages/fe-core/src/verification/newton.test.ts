/**
 * The nonlinear driver on a J2 plasticity case: a quarter plate with a hole (plane stress, Q8,
 * σ_y = 250 MPa, linear isotropic hardening) pulled past first yield at the hole.
 *
 * - Newton–Raphson with the consistent tangent converges quadratically near the solution
 *   (e.g. Simo & Hughes, Computational Inelasticity, §3.3; Wriggers, Nonlinear Finite Element
 *   Methods, §5.1): the observed order log(r_{k+1}/r_k)/log(r_k/r_{k−1}) of the relative residual
 *   tends to 2.
 * - Automatic cut-back: one increment over the whole load with few iterations allowed must fail,
 *   be cut back, recover, and end in equilibrium (bottom reaction = applied traction × width).
 * - Past the limit load with force control the driver stops with the converged frames and a
 *   reason an analyst can act on.
 */
import { describe, expect, it } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { buildProblem } from '../assembly/problem';
import { quarterPlateWithHole } from '../mesh/structured';
import { runAnalysis } from '../solve/nonlinear/driver';
import { check } from './support';

const W = 25;
const mesh = quarterPlateWithHole({ radius: 5, halfWidth: W, halfHeight: W, nAround: 4, nRadial: 6, ratio: 4 }, { type: 'q8', section: 's', material: 'steel' });

function plate(load: number, increments: { initial: number; min: number; max: number; maxIterations: number }, H_iso = 1000): ModelInput {
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 1 } },
    materials: { steel: { model: 'j2-plastic', E: 200000, nu: 0.3, sigma_y: 250, H_iso } },
    supports: [
      { type: 'symmetry', set: 'left', normal: 'x' },
      { type: 'symmetry', set: 'bottom', normal: 'y' },
    ],
    loads: [{ type: 'traction', name: 'pull', edgeSet: 'top', direction: [0, 1] }],
    segments: [{ name: 'load', targets: { pull: load }, increments }],
    output: { fields: ['displacement'], points: [{ name: 'corner', x: W, y: W }], reactionSums: [{ name: 'base', set: 'bottom' }] },
    solver: { forceTolerance: 1e-10, displacementTolerance: 1e-10, lineSearch: false },
  };
}

function solve(input: ModelInput, onResidual?: (increment: number, iteration: number, r: number) => void) {
  const parsed = parseModel(input);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  let cutBacks = 0;
  let key = 0;
  const result = runAnalysis(buildProblem(parsed.model), {
    onIteration: (i) => {
      if (i.iteration === 0) key++;
      onResidual?.(key, i.iteration, i.residualNorm);
    },
    onCutBack: () => cutBacks++,
  });
  return { result, cutBacks };
}

/** Small fixed increments to 160 MPa: the reference path, with every increment's residuals. */
let smallSteps: { result: ReturnType<typeof solve>['result']; sequences: Map<number, number[]> } | undefined;
function smallStepRun() {
  if (!smallSteps) {
    const sequences = new Map<number, number[]>();
    const { result } = solve(plate(160, { initial: 0.05, min: 0.001, max: 0.05, maxIterations: 20 }), (inc, _it, r) => {
      if (!sequences.has(inc)) sequences.set(inc, []);
      sequences.get(inc)!.push(r);
    });
    smallSteps = { result, sequences };
  }
  return smallSteps;
}

describe('Newton–Raphson on J2 plasticity', () => {
  it('converges quadratically near the solution', () => {
    const { result, sequences } = smallStepRun();
    expect(result.status).toBe('succeeded');
    const orders: number[] = [];
    for (const r of sequences.values()) {
      // Asymptotic range: from below 1e-2 down to just above round-off.
      for (let k = 1; k + 1 < r.length; k++) {
        if (r[k - 1] < 1e-2 && r[k + 1] > 1e-13) orders.push(Math.log(r[k + 1] / r[k]) / Math.log(r[k] / r[k - 1]));
      }
    }
    expect(orders.length).toBeGreaterThan(5);
    orders.sort((a, b) => a - b);
    const median = orders[Math.floor(orders.length / 2)];
    check({
      suite: 'Nonlinear driver',
      name: 'J2 plate with a hole: observed Newton convergence order (median over plastic increments)',
      computed: median,
      target: 2,
      unit: '–',
      tolerance: 0.25,
      absolute: true,
      source: 'quadratic convergence of Newton with the consistent tangent (Simo & Hughes 1998, Computational Inelasticity)',
      tag: 'closed',
    });
  });

  it('cuts an increment back and recovers, ending in equilibrium', () => {
    const sigma = 160;
    const { result, cutBacks } = solve(plate(sigma, { initial: 1, min: 0.001, max: 1, maxIterations: 5 }));
    expect(result.status).toBe('succeeded');
    expect(cutBacks).toBeGreaterThan(0);
    expect(result.stats.cutBacks).toBe(cutBacks);
    const last = result.frames[result.frames.length - 1];
    check({
      suite: 'Nonlinear driver',
      name: `J2 plate after ${cutBacks} cut-backs: bottom reaction = −σ·W·t`,
      computed: last.history['base.Fy'],
      target: -sigma * W * 1,
      unit: 'N',
      tolerance: 1e-8,
      source: 'static equilibrium of the quarter plate',
      tag: 'closed',
    });
    // The same load path in small steps gives the same answer.
    const reference = smallStepRun().result;
    const ref = reference.frames[reference.frames.length - 1].history['corner.uy'];
    expect(Math.abs(last.history['corner.uy'] - ref) / Math.abs(ref)).toBeLessThan(1e-4);
  });

  it('stops past the limit load with the converged frames and an actionable reason', () => {
    // Perfectly plastic: the net section (W − a)·σ_y caps the remote traction near 200 MPa.
    const { result } = solve(plate(260, { initial: 0.25, min: 0.01, max: 0.25, maxIterations: 8 }, 0));
    expect(result.status).toBe('failed');
    expect(result.frames.length).toBeGreaterThan(2);
    expect(result.failure?.message).toMatch(/Segment "load" stopped at t = /);
    expect(result.failure?.message).toMatch(/prescribe displacement instead of force|displacement instead of force/);
    const lastTime = result.frames[result.frames.length - 1].time;
    expect(lastTime).toBeLessThan(1);
    expect(lastTime * 260).toBeGreaterThan(150);
  });
});
