/**
 * What the worker needs from a solver: solve a frozen snapshot, calling back after every Newton
 * iteration and every converged frame, and checking `shouldStop()` between iterations so that a
 * cancel (or a worker shutdown) stops the computation itself, not just the job row.
 */
import type { MaterialParams } from '@phaseloop/shared';

export interface RunSnapshotForSolver {
  study: { id: string; name: string; revision: number; definition: Record<string, unknown> };
  materials: { versionId: string; materialId: string; name: string; version: number; params: MaterialParams }[];
  solverVersion: string;
}

export interface IterationReport {
  segment: number;
  increment: number;
  iteration: number;
  time: number;
  residualNorm: number;
  correctionNorm: number;
  cutBacks: number;
}

export interface FrameReport {
  segment: number;
  increment: number;
  time: number;
  history: Record<string, number>;
  /** Small scalar summary of the frame's fields (max von Mises, max martensite fraction). */
  summary?: { maxVonMises: number; maxXi: number };
  /** Result files of this frame (e.g. a VTU piece), written to the run's storage. */
  files?: { name: string; contentType: string; bytes: Uint8Array }[];
}

export interface SolveHooks {
  onIteration(report: IterationReport): void;
  onFrame(report: FrameReport): Promise<void>;
  shouldStop(): boolean;
  /** Graceful shutdown: stop once the increment in progress has converged. */
  shouldStopAfterIncrement?(): boolean;
  onLog?(level: 'info' | 'warn' | 'error', message: string): void;
}

export interface OutputFile { name: string; contentType: string; bytes: Uint8Array }

export type SolveOutcome =
  | { kind: 'succeeded'; message: string; files?: { name: string; contentType: string; bytes: Uint8Array }[] }
  | { kind: 'failed'; message: string; files?: OutputFile[] }
  /** shouldStop() turned true and the solver stopped between iterations. */
  | { kind: 'stopped'; message: string; files?: OutputFile[] };

export interface RunSolver {
  solve(snapshot: RunSnapshotForSolver, hooks: SolveHooks): Promise<SolveOutcome>;
}

/**
 * Until fe-core's study driver is wired in (runs issue), runs end with a plain statement instead
 * of a fake result.
 */
export const unavailableSolver: RunSolver = {
  async solve() {
    return { kind: 'failed', message: 'This build of Phaseloop cannot solve studies yet: the solver is not connected to the worker.' };
  },
};
