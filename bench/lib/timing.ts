/** Timing helpers for benchmarks (wall clock, min over repetitions: the least disturbed run). */

export interface Timed<T> {
  readonly seconds: number;
  readonly all: number[];
  readonly value: T;
}

/** Runs fn `reps` times; returns the minimum wall time in seconds and the last result. */
export function minTime<T>(reps: number, fn: () => T): Timed<T> {
  const all: number[] = [];
  let value!: T;
  for (let r = 0; r < reps; r++) {
    const t0 = performance.now();
    value = fn();
    all.push((performance.now() - t0) / 1000);
  }
  return { seconds: Math.min(...all), all, value };
}

/** Peak resident set size of this process in MiB. */
export function peakRssMiB(): number {
  return process.resourceUsage().maxRSS / 1024;
}
