/** Messages between the worker process and its solve thread. */
import type { IterationReport } from './solver';

/** Values of the shared stop flag (Int32Array[0]). */
export const RUN_ON = 0;
export const STOP_NOW = 1;
/** Graceful shutdown: finish the increment in progress, then stop. */
export const STOP_AFTER_INCREMENT = 2;

export interface ThreadInput {
  model: unknown;
  stopFlag: SharedArrayBuffer;
}

export type ThreadMessage =
  | { type: 'iteration'; report: IterationReport }
  | { type: 'log'; level: 'info' | 'warn' | 'error'; message: string }
  | {
    type: 'frame'; index: number; segment: number; increment: number; time: number; history: Record<string, number>;
    maxVonMises: number; maxXi: number; vtu: Uint8Array;
  }
  | {
    type: 'done'; status: 'succeeded' | 'failed' | 'cancelled'; message: string;
    files?: {
      resultJson: Uint8Array; pvd: Uint8Array; csv: Uint8Array;
      /** RESULT.json split for frame-by-frame loading (result-mesh.json, result-frame-<k>.json). */
      split?: { name: string; contentType: string; bytes: Uint8Array }[];
    };
  };
