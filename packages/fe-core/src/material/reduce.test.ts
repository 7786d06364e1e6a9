/**
 * Checks of the stress-state reductions themselves (material/reduce.ts) with closed forms of
 * isotropic elasticity, plus the local Newton on the free strains converging for J2.
 * The condensed tangents are checked by finite differences in elastic.test.ts and j2.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { createLinearElastic } from './elastic';
import { createJ2Plastic } from './j2';
import { ReducedMaterial, createReducedOutput } from './reduce';

const E = 200_000, nu = 0.3, alpha = 1e-5;
const elastic = createLinearElastic({ model: 'linear-elastic', E, nu, alpha, T_ref: 20 });

function once<P>(r: ReducedMaterial<P>, strain: number[], temperature = 20) {
  const old = new Float64Array(Math.max(1, r.stateSize));
  r.initState(old, 0, 20);
  const state = new Float64Array(old.length);
  const out = createReducedOutput(r.stressState);
  r.update({ strain: Float64Array.from(strain), strainOld: new Float64Array(r.size), temperature, temperatureOld: 20 }, old, 0, state, 0, out);
  return { out, state };
}

describe('stress-state reductions', () => {
  it('plane stress: σ33 = 0 and ε33 = −ν/(1−ν)(ε11 + ε22) + (1+ν)/(1−ν) αΔT (closed form)', () => {
    const r = new ReducedMaterial(elastic, 'planeStress');
    const { out, state } = once(r, [1e-3, -4e-4, 2e-4], 70);
    expect(out.ok).toBe(true);
    expect(Math.abs(out.fullStress[2])).toBeLessThan(1e-9);
    const e33 = (-nu / (1 - nu)) * (1e-3 - 4e-4) + ((1 + nu) / (1 - nu)) * alpha * 50;
    expect(out.fullStrain[2]).toBeCloseTo(e33, 14);
    // The converged free strain is stored after the material state as the next start value.
    expect(state[r.material.stateSize]).toBeCloseTo(e33, 14);
  });

  it('uniaxial: σ = Eε, lateral strains −νε, no lateral stress (closed form)', () => {
    const r = new ReducedMaterial(elastic, 'uniaxial');
    const { out } = once(r, [1e-3]);
    expect(out.stress[0]).toBeCloseTo(E * 1e-3, 9);
    expect(out.tangent[0]).toBeCloseTo(E, 6);
    expect(out.fullStrain[1]).toBeCloseTo(-nu * 1e-3, 14);
    expect(out.fullStrain[2]).toBeCloseTo(-nu * 1e-3, 14);
    expect(Math.abs(out.fullStress[1]) + Math.abs(out.fullStress[2])).toBeLessThan(1e-9);
  });

  it('plane strain: σ33 = ν(σ11 + σ22) (closed form), axisymmetric passes the hoop strain through', () => {
    const ps = once(new ReducedMaterial(elastic, 'planeStrain'), [1e-3, 5e-4, 0]).out;
    expect(ps.fullStress[2]).toBeCloseTo(nu * (ps.fullStress[0] + ps.fullStress[1]), 9);
    const ax = once(new ReducedMaterial(elastic, 'axisymmetric'), [0, 0, 1e-3, 0]).out;
    // Hoop-only strain: σθθ = (λ + 2μ)ε, σrr = σzz = λε.
    const lambda = (E * nu) / ((1 + nu) * (1 - 2 * nu)), mu = E / (2 * (1 + nu));
    expect(ax.stress[2]).toBeCloseTo((lambda + 2 * mu) * 1e-3, 8);
    expect(ax.stress[0]).toBeCloseTo(lambda * 1e-3, 8);
  });

  it('plane-stress and uniaxial J2 points converge deep in the plastic range', () => {
    const j2 = createJ2Plastic({ model: 'j2-plastic', E, nu, alpha: 0, T_ref: 20, sigma_y: 250, H_iso: 0, H_kin: 0 });
    const ps = once(new ReducedMaterial(j2, 'planeStress'), [0.02, -0.005, 0.01]).out;
    expect(ps.ok).toBe(true);
    expect(Math.abs(ps.fullStress[2])).toBeLessThan(1e-7);
    // Perfect plasticity: the von Mises stress sits on σ_y.
    const [s11, s22, , , , s12km] = ps.fullStress;
    const s12 = s12km / Math.SQRT2;
    expect(Math.sqrt(s11 * s11 - s11 * s22 + s22 * s22 + 3 * s12 * s12)).toBeCloseTo(250, 6);
    const ua = once(new ReducedMaterial(j2, 'uniaxial'), [-0.03]).out;
    expect(ua.ok).toBe(true);
    expect(ua.stress[0]).toBeCloseTo(-250, 6);
  });
});

describe('regression: zero-stress states', () => {
  it('plane stress converges for a freely expanding heated point (σ = 0, ε = αΔT)', () => {
    // Before the fix the σ33 = 0 tolerance fell below round-off when all stresses vanish.
    const r = new ReducedMaterial(elastic, 'planeStress');
    const { out } = once(r, [alpha * 100, alpha * 100, 0], 120);
    expect(out.ok).toBe(true);
    expect(out.fullStrain[2]).toBeCloseTo(alpha * 100, 14);
    for (const s of out.fullStress) expect(Math.abs(s)).toBeLessThan(1e-9);
  });
});
