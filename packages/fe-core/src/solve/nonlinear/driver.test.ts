/**
 * Behaviour of the nonlinear driver that the verification suite does not cover: segment ramps
 * and holds, per-node temperature, frames, hooks, cancel, async running and unconstrained models.
 * Values are checked against closed forms of a uniaxial strip: with u_x prescribed on the right
 * edge and the left edge on rollers, σ_xx = E·u/L exactly for any mesh.
 */
import { describe, expect, it } from 'vitest';
import { parseModel, type ModelInput } from '@phaseloop/shared';
import { buildProblem } from '../../assembly/problem';
import { rectangle } from '../../mesh/structured';
import { analysisSteps, runAnalysis, runAnalysisAsync, type IterationInfo } from './driver';
import { defaultSolverFactory } from './solverChoice';

const L = 20, Hh = 4, E = 100000;

function strip(extra: Partial<ModelInput> = {}): ModelInput {
  const mesh = rectangle({ width: L, height: Hh, nx: 4, ny: 2 }, { type: 'q4', section: 's', material: 'm' });
  return {
    format: 'phaseloop-model/1',
    ...mesh,
    nodeSets: { ...mesh.nodeSets, origin: [1] },
    sections: { s: { kind: 'continuum', analysis: 'planeStress', thickness: 2 } },
    materials: { m: { model: 'linear-elastic', E, nu: 0.25, alpha: 1e-5, T_ref: 20 } },
    supports: [
      { type: 'fixed', set: 'left', dofs: ['ux'] },
      { type: 'fixed', set: 'origin', dofs: ['uy'] },
    ],
    loads: [{ type: 'displacement', name: 'stretch', set: 'right', dof: 'ux' }],
    segments: [
      { name: 'pull', duration: 2, targets: { stretch: 0.02 }, increments: { initial: 0.5, min: 0.01, max: 0.5 } },
      { name: 'hold', duration: 1, increments: { initial: 1, min: 0.1, max: 1 }, frames: 'end' },
      { name: 'release', duration: 1, targets: { stretch: 0 }, increments: { initial: 0.25, min: 0.01, max: 0.25 } },
    ],
    output: { fields: ['displacement', 'reaction', 'stress'], points: [], reactionSums: [{ name: 'left', set: 'left' }], integrationPoints: false },
    ...extra,
  };
}

function problemOf(input: ModelInput) {
  const parsed = parseModel(input);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return buildProblem(parsed.model);
}

describe('nonlinear driver', () => {
  it('ramps targets linearly per segment, holds them, and keeps the requested frames', () => {
    const result = runAnalysis(problemOf(strip()));
    expect(result.status).toBe('succeeded');
    // frame 0 + 2 (pull) + 1 (hold, end only) + 4 (release)
    expect(result.frames.map((f) => f.time)).toEqual([0, 1, 2, 3, 3.25, 3.5, 3.75, 4]);
    for (const f of result.frames) {
      const u = f.time <= 2 ? (0.02 * f.time) / 2 : f.time <= 3 ? 0.02 : 0.02 * (4 - f.time);
      // σ_xx = E u / L everywhere; reaction on the left edge = −σ·H·t (closed form, uniaxial stress).
      expect(f.pointStress[0]).toBeCloseTo((E * u) / L, 8);
      expect(f.history['left.Fx']).toBeCloseTo((-E * u * Hh * 2) / L, 6);
    }
  });

  it('ramps per-node temperatures; a free strip expands by αΔT without stress', () => {
    const input = strip({
      loads: [],
      segments: [{ name: 'heat', temperature: { base: 20, nodeSets: { all: 120 }, nodes: [] }, increments: { initial: 0.5, min: 0.1, max: 1 } }],
    });
    const result = runAnalysis(problemOf(input));
    const last = result.frames[result.frames.length - 1];
    const problem = problemOf(input);
    const right = problem.nodeIndex.get(input.nodeSets!.right[0])!;
    expect(last.displacement[3 * right]).toBeCloseTo(1e-5 * 100 * L, 10);
    expect(Math.max(...Array.from(last.pointStress).map(Math.abs))).toBeLessThan(1e-8);
    expect(last.temperature.every((t) => t === 120)).toBe(true);
  });

  it('reports every iteration and frame through the hooks, in order', () => {
    const iterations: IterationInfo[] = [];
    const frames: number[] = [];
    runAnalysis(problemOf(strip()), { onIteration: (i) => iterations.push(i), onFrame: (f) => frames.push(f.index) });
    expect(frames).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    expect(iterations[0]).toMatchObject({ segment: 0, segmentName: 'pull', increment: 1, iteration: 0, cutBacks: 0 });
    // Linear problem: the predictor (converged tangent + load and prescribed steps) is exact, so
    // every increment converges at iteration 0 with a round-off residual.
    expect(iterations.every((i) => i.iteration === 0 && i.residualNorm < 1e-9)).toBe(true);
  });

  it('without the predictor, a linear problem needs exactly one correction per increment', () => {
    const iterations: IterationInfo[] = [];
    const result = runAnalysis(problemOf(strip()), { predictor: false, onIteration: (i) => iterations.push(i) });
    expect(result.status).toBe('succeeded');
    const last = iterations.filter((i, k) => k + 1 === iterations.length || iterations[k + 1].iteration === 0);
    expect(last.every((i) => i.iteration <= 1 && i.residualNorm < 1e-9)).toBe(true);
    const withPredictor = runAnalysis(problemOf(strip()));
    result.frames.forEach((f, k) => expect(f.history['left.Fx']).toBeCloseTo(withPredictor.frames[k].history['left.Fx'], 6));
  });

  it('stops between iterations when asked and keeps the converged frames', () => {
    let calls = 0;
    const result = runAnalysis(problemOf(strip()), { shouldStop: () => ++calls > 5 });
    expect(result.status).toBe('cancelled');
    expect(result.frames.length).toBeGreaterThan(1);
    expect(result.frames.length).toBeLessThan(8);
  });

  it('runs cooperatively (async) with the same answer, and as a generator', async () => {
    const sync = runAnalysis(problemOf(strip()));
    const async = await runAnalysisAsync(problemOf(strip()));
    expect(async.frames.map((f) => f.history['left.Fx'])).toEqual(sync.frames.map((f) => f.history['left.Fx']));
    const gen = analysisSteps(problemOf(strip()));
    let yields = 0;
    let next = gen.next();
    while (!next.done) {
      yields++;
      next = gen.next();
    }
    expect(yields).toBe(sync.stats.iterations);
  });

  it('async: a cancel request arriving from the event loop stops the run between iterations', async () => {
    let stop = false;
    setTimeout(() => (stop = true), 0);
    const result = await runAnalysisAsync(problemOf(strip()), { shouldStop: () => stop }, 0);
    expect(result.status).toBe('cancelled');
    expect(result.frames.length).toBeLessThan(8);
  });

  it('names the node and direction of an unconstrained model', () => {
    // Only u_x held: the strip can slide in y.
    const result = runAnalysis(problemOf(strip({ supports: [{ type: 'fixed', set: 'left', dofs: ['ux'] }] })));
    expect(result.status).toBe('failed');
    expect(result.failure?.kind).toBe('unconstrained');
    expect(result.failure?.direction).toBe('uy');
    expect(result.failure?.node).toBeGreaterThan(0);
    expect(result.failure?.message).toMatch(/not held: it can move without resistance \(free: translation in y\); the stiffness vanished at node \d+ in direction uy/);
  });

  it('gives the same answer with the profile LU and the multifrontal solver', () => {
    const input = strip();
    const a = runAnalysis(problemOf(input), { createSolver: defaultSolverFactory({ nDof: 1e6 }, 'multifrontal') });
    const b = runAnalysis(problemOf(input), { createSolver: defaultSolverFactory({ nDof: 1e6 }, 'profile') });
    const ua = a.frames[2].displacement;
    const ub = b.frames[2].displacement;
    for (let k = 0; k < ua.length; k++) expect(ua[k]).toBeCloseTo(ub[k], 12);
  });
});

describe('nonlinear driver on a homogeneous J2 strip', () => {
  // Uniaxial stress with linear isotropic hardening (closed form): beyond ε_y = σ_y/E,
  // σ = σ_y + E·H/(E + H)·(ε − σ_y/E).
  const sigmaY = 200, Hiso = 10000;
  for (const lineSearch of [false, true]) {
    it(`follows the closed-form stress–strain curve (line search ${lineSearch ? 'on' : 'off'})`, () => {
      const input = strip({
        materials: { m: { model: 'j2-plastic', E, nu: 0.25, sigma_y: sigmaY, H_iso: Hiso } },
        segments: [{ name: 'pull', targets: { stretch: 0.2 }, increments: { initial: 0.1, min: 0.001, max: 0.2 } }],
        solver: { forceTolerance: 1e-9, displacementTolerance: 1e-9, lineSearch },
      });
      const result = runAnalysis(problemOf(input));
      expect(result.status).toBe('succeeded');
      for (const f of result.frames) {
        const eps = f.displacement[3 * (input.nodeSets!.right[0] - 1)] / L;
        const target = eps <= sigmaY / E ? E * eps : sigmaY + ((E * Hiso) / (E + Hiso)) * (eps - sigmaY / E);
        expect(f.pointStress[0]).toBeCloseTo(target, 6);
      }
    });
  }
});
