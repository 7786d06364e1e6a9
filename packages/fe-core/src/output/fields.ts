/**
 * Nodal fields of a frame by name, as the writers (VTU, CSV, RESULT.json) present them.
 * Tensors are given with tensor (not Kelvin–Mandel) shear components, in the order
 * xx, yy, zz, yz, xz, xy; nodal tensor fields are averages of the element extrapolations.
 */
import type { FieldName } from '@phaseloop/shared';
import type { Problem } from '../assembly/problem';
import { pointScalar, principalField, vonMises, type Frame } from './frame';
import { recoverNodal } from './recovery';

export interface NodalField {
  name: FieldName;
  components: readonly string[];
  /** Node-major values, length nodes × components (NaN where no element contributes). */
  values: Float64Array;
}

export const TENSOR_COMPONENTS = ['xx', 'yy', 'zz', 'yz', 'xz', 'xy'] as const;

/** Kelvin–Mandel → tensor components in place (shear / √2). */
export function kelvinToTensor(field: Float64Array): Float64Array {
  const out = field.slice();
  for (let k = 0; k < out.length; k += 6) {
    out[k + 3] /= Math.SQRT2;
    out[k + 4] /= Math.SQRT2;
    out[k + 5] /= Math.SQRT2;
  }
  return out;
}

/** Integration-point fields of a frame by name (for RESULT.json's optional point data). */
export function pointField(frame: Frame, name: FieldName): { components: readonly string[]; values: Float64Array } | null {
  switch (name) {
    case 'stress':
      return { components: TENSOR_COMPONENTS, values: kelvinToTensor(frame.pointStress) };
    case 'strain':
      return { components: TENSOR_COMPONENTS, values: kelvinToTensor(frame.pointStrain) };
    case 'vonMises':
      return { components: ['value'], values: pointScalar(frame.pointStress, vonMises) };
    case 'principalStress':
      return { components: ['p1', 'p2', 'p3'], values: principalField(frame.pointStress) };
    case 'principalStrain':
      return { components: ['p1', 'p2', 'p3'], values: principalField(frame.pointStrain) };
    case 'martensiteFraction':
      return { components: ['value'], values: frame.pointXi };
    case 'eqPlasticStrain':
      return { components: ['value'], values: frame.pointEqPlastic };
    case 'transformationStrain':
      return { components: TENSOR_COMPONENTS, values: kelvinToTensor(frame.pointTransformationStrain) };
    default:
      return null;
  }
}

export function nodalField(problem: Problem, frame: Frame, name: FieldName): NodalField {
  switch (name) {
    case 'displacement':
      return { name, components: ['ux', 'uy', 'rz'], values: frame.displacement };
    case 'reaction':
      return { name, components: ['Fx', 'Fy', 'Mz'], values: frame.reaction };
    case 'temperature':
      return { name, components: ['T'], values: frame.temperature };
    default: {
      const p = pointField(frame, name)!;
      return { name, components: p.components, values: recoverNodal(problem, p.values, p.components.length) };
    }
  }
}
