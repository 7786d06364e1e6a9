/**
 * Machine description for benchmark reports: date, core count, CPU model, Node version and load.
 * Benchmarks on a shared machine are noisy, so the load average is reported next to the timings.
 */
import { readFileSync } from 'node:fs';
import { availableParallelism, loadavg, totalmem } from 'node:os';

export interface MachineInfo {
  readonly date: string;
  readonly nproc: number;
  readonly cpu: string;
  readonly node: string;
  readonly memoryGiB: number;
  /** 1-minute load average when the benchmark started. */
  readonly load1: number;
}

export function machineInfo(): MachineInfo {
  let cpu = 'unknown CPU';
  try {
    const line = readFileSync('/proc/cpuinfo', 'utf8')
      .split('\n')
      .find((l) => l.startsWith('model name'));
    if (line) cpu = line.split(':')[1].trim();
  } catch {
    // not Linux: keep the placeholder
  }
  return {
    date: new Date().toISOString().replace(/\.\d+Z$/, 'Z'),
    nproc: availableParallelism(),
    cpu,
    node: process.version,
    memoryGiB: Math.round(totalmem() / 2 ** 30),
    load1: Math.round(loadavg()[0] * 100) / 100,
  };
}

export function machineLine(m: MachineInfo = machineInfo()): string {
  return `${m.date} · ${m.nproc} cores (${m.cpu}) · ${m.memoryGiB} GiB · Node ${m.node} · load ${m.load1}`;
}
