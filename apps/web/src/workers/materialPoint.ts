/** Messages of the material-point web worker (materialPoint.worker.js). */
import type { MaterialParams } from '@phaseloop/shared';

/** One parameter set to trace; `key` comes back with its curves (e.g. the version id, or "a"/"b" in a comparison). */
export interface MaterialPointSet {
  key: string;
  params: MaterialParams;
}

export interface MaterialPointRequest {
  id: number;
  sets: MaterialPointSet[];
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

export interface MaterialPointSetAnswer {
  key: string;
  curves: MaterialPointCurve[];
  /** Why this set could not be traced at all (e.g. the calibration refused its constants). */
  error?: string;
}

export interface MaterialPointAnswer {
  id: number;
  sets: MaterialPointSetAnswer[];
}
