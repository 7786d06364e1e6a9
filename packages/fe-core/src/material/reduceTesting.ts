/**
 * Test helpers for materials (not used by the engine): finite-difference tangents of 3D and
 * reduced material updates. Central differences, state always re-read from the same stateOld.
 */
import { ReducedMaterial, createReducedOutput } from './reduce';
import { KM, createMaterialPointOutput, type Material } from './types';

export interface PointLoad {
  strain: Float64Array;
  strainOld: Float64Array;
  temperature: number;
  temperatureOld: number;
}

/** Largest |C_analytic − C_fd| relative to the largest |C| entry, for a 3D material. */
export function tangentErrorSolid<P>(material: Material<P>, load: PointLoad, stateOld: Float64Array, h = 1e-8): number {
  const state = new Float64Array(Math.max(1, material.stateSize));
  const out = createMaterialPointOutput();
  const plus = createMaterialPointOutput();
  const minus = createMaterialPointOutput();
  const input = { ...load, strain: Float64Array.from(load.strain) };
  material.update(input, stateOld, 0, state, 0, out);
  let scale = 0;
  for (const c of out.tangent) scale = Math.max(scale, Math.abs(c));
  let worst = 0;
  for (let j = 0; j < KM; j++) {
    input.strain.set(load.strain);
    input.strain[j] += h;
    material.update(input, stateOld, 0, state, 0, plus);
    input.strain.set(load.strain);
    input.strain[j] -= h;
    material.update(input, stateOld, 0, state, 0, minus);
    for (let i = 0; i < KM; i++) {
      const fd = (plus.stress[i] - minus.stress[i]) / (2 * h);
      worst = Math.max(worst, Math.abs(fd - out.tangent[i * KM + j]));
    }
  }
  return worst / scale;
}

/** Same check through a ReducedMaterial (condensed tangent vs. finite differences). */
export function tangentErrorReduced<P>(reduced: ReducedMaterial<P>, load: PointLoad, stateOld: Float64Array, h = 1e-8): number {
  const n = reduced.size;
  const state = new Float64Array(Math.max(1, reduced.stateSize));
  const out = createReducedOutput(reduced.stressState);
  const plus = createReducedOutput(reduced.stressState);
  const minus = createReducedOutput(reduced.stressState);
  const input = { ...load, strain: Float64Array.from(load.strain) };
  reduced.update(input, stateOld, 0, state, 0, out);
  if (!out.ok) throw new Error(out.message);
  let scale = 0;
  for (const c of out.tangent) scale = Math.max(scale, Math.abs(c));
  let worst = 0;
  for (let j = 0; j < n; j++) {
    input.strain.set(load.strain);
    input.strain[j] += h;
    reduced.update(input, stateOld, 0, state, 0, plus);
    input.strain.set(load.strain);
    input.strain[j] -= h;
    reduced.update(input, stateOld, 0, state, 0, minus);
    for (let i = 0; i < n; i++) {
      const fd = (plus.stress[i] - minus.stress[i]) / (2 * h);
      worst = Math.max(worst, Math.abs(fd - out.tangent[i * n + j]));
    }
  }
  return worst / scale;
}

/**
 * Drives a reduced material point through a sequence of reduced strains (one increment each),
 * swapping state after every step as the global driver does. Returns the stress after each step.
 */
export function driveReduced<P>(
  reduced: ReducedMaterial<P>,
  path: readonly (readonly number[])[],
  temperatures?: readonly number[],
  initialTemperature = 20,
): { stresses: Float64Array[]; stateOld: Float64Array; strainOld: Float64Array; temperatureOld: number } {
  let stateOld = new Float64Array(Math.max(1, reduced.stateSize));
  let state = new Float64Array(stateOld.length);
  reduced.initState(stateOld, 0, initialTemperature);
  const out = createReducedOutput(reduced.stressState);
  let strainOld = new Float64Array(reduced.size);
  let tOld = initialTemperature;
  const stresses: Float64Array[] = [];
  path.forEach((step, k) => {
    const strain = Float64Array.from(step);
    const t = temperatures ? temperatures[k] : initialTemperature;
    reduced.update({ strain, strainOld, temperature: t, temperatureOld: tOld }, stateOld, 0, state, 0, out);
    if (!out.ok) throw new Error(out.message);
    stresses.push(Float64Array.from(out.stress));
    [stateOld, state] = [state, stateOld];
    strainOld = strain;
    tOld = t;
  });
  return { stresses, stateOld, strainOld, temperatureOld: tOld };
}
