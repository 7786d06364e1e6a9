/** Messages of the material-point web worker (materialPoint.worker.js). */
import type { MaterialParams } from '@phaseloop/shared';

export interface MaterialPointRequest {
  id: number;
  params: MaterialParams;
  temperatures: number[];
  /** Peak axial strain (absolute, e.g. 0.06). */
  peakStrain: number;
}

export interface MaterialPointCurve {
  temperature: number;
  ok: boolean;
  message: string;
  /** (strain %, stress MPa, ξ) rows. */
  points: [number, number, number][];
}

export interface MaterialPointAnswer {
  id: number;
  curves: MaterialPointCurve[];
  error?: string;
}
