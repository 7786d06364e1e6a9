/**
 * Timing helpers for benchmarks: wall clock and process CPU time, min over repetitions (the least
 * disturbed run). On a shared machine the CPU time is the steadier of the two.
 */

export interface Timed<T> {
  readonly seconds: number;
  readonly cpuSeconds: number;
  readonly all: number[];
  readonly value: T;
}

/** Runs fn `reps` times; returns the minimum wall and CPU times in seconds and the last result. */
export function minTime<T>(reps: number, fn: () => T): Timed<T> {
  const all: number[] = [];
  const cpu: number[] = [];
  let value!: T;
  for (let r = 0; r < reps; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    value = fn();
    all.push((performance.now() - t0) / 1000);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1e6);
  }
  return { seconds: Math.min(...all), cpuSeconds: Math.min(...cpu), all, value };
}

/** Peak resident set size of this process in MiB. */
export function peakRssMiB(): number {
  return process.resourceUsage().maxRSS / 1024;
}
