/**
 * History presets: functions that write template segments for the usual nitinol load cases.
 * `load` values are in the template's own unit (see each template's `load` description).
 */
import type { TemplateSegment } from '@phaseloop/shared';

const segment = (name: string, increments: number, values: { load?: number; temperature?: number; duration?: number }): TemplateSegment => ({
  name,
  duration: values.duration ?? 1,
  increments,
  ...(values.load !== undefined ? { load: values.load } : {}),
  ...(values.temperature !== undefined ? { temperature: values.temperature } : {}),
});

/** Load to `peak` and back to `rest` at constant temperature (the superelastic loop). */
export function pseudoelasticCycle(o: { peak: number; rest?: number; increments?: number; temperature?: number }): TemplateSegment[] {
  const n = o.increments ?? 60;
  return [
    segment(`load to ${o.peak}`, n, { load: o.peak, temperature: o.temperature }),
    segment('unload', n, { load: o.rest ?? 0 }),
  ];
}

/**
 * The ASTM F2516 tension sequence up to the pull to failure (which a strain-hardening-free model
 * cannot represent): load to `peak` strain (6 % in the standard), unload to zero.
 */
export function tensileTestSequence(o: { peak?: number; increments?: number } = {}): TemplateSegment[] {
  const peak = o.peak ?? 6;
  const n = o.increments ?? 60;
  return [segment(`load to ${peak} %`, n, { load: peak }), segment('unload', n, { load: 0 })];
}

/**
 * Isobaric thermal cycles: apply `load` at the current temperature, then cool to `low` and heat
 * to `high` `cycles` times with the load held. By default 0.5 °C steps, so that a
 * transformation range of 10 °C gets about 20 increments.
 */
export function isobaricThermalCycle(o: { load: number; low: number; high: number; cycles?: number; increments?: number; duration?: number }): TemplateSegment[] {
  const n = o.increments ?? Math.max(40, Math.ceil(2 * (o.high - o.low)));
  const out = [segment('apply load', 4, { load: o.load })];
  const cycles = o.cycles ?? 1;
  for (let c = 1; c <= cycles; c++) {
    const tag = cycles > 1 ? ` ${c}` : '';
    out.push(segment(`cool${tag}`, n, { temperature: o.low, duration: o.duration ?? 60 }));
    out.push(segment(`heat${tag}`, n, { temperature: o.high, duration: o.duration ?? 60 }));
  }
  return out;
}

/**
 * Shape-memory sequence: cool stress-free to `low`, load to `peak` and unload there, then heat
 * to `high` (the shape recovers) and cool back to `low`. Needs a material that reorients
 * martensite below Mf (Souza–Auricchio): with the phase-fraction model (Lagoudas 2012) loading
 * self-accommodated martensite stays elastic and nothing is left to recover.
 */
export function shapeMemorySequence(o: { peak: number; low: number; high: number; increments?: number }): TemplateSegment[] {
  const n = o.increments ?? 60;
  return [
    segment('cool', n, { temperature: o.low, duration: 60 }),
    segment(`load to ${o.peak}`, n, { load: o.peak }),
    segment('unload', n, { load: 0 }),
    segment('heat (recovery)', n, { temperature: o.high, duration: 60 }),
    segment('cool back', n, { temperature: o.low, duration: 60 }),
  ];
}

/** `cycles` pulsatile cycles between `high` and `low` (starting towards `high`). */
export function pulsatileCycles(o: { high: number; low: number; cycles: number; increments?: number; period?: number }): TemplateSegment[] {
  const n = o.increments ?? 10;
  const half = (o.period ?? 60 / 72) / 2;
  const out: TemplateSegment[] = [];
  for (let c = 1; c <= o.cycles; c++) {
    out.push(segment(`systole ${c}`, n, { load: o.high, duration: half }));
    out.push(segment(`diastole ${c}`, n, { load: o.low, duration: half }));
  }
  return out;
}

/**
 * Stent history: crimp at `crimpTemperature` to `crimped`, release to `vessel`, warm to body
 * temperature, then `cycles` pulsatile cycles of ±change/2 about the vessel value.
 */
export function stentHistory(o: {
  crimped: number;
  vessel: number;
  change: number;
  bodyTemperature: number;
  cycles: number;
  increments?: number;
}): TemplateSegment[] {
  const n = o.increments ?? 40;
  return [
    segment('crimp', n, { load: o.crimped }),
    segment('release', n, { load: o.vessel }),
    segment('body temperature', 10, { temperature: o.bodyTemperature, duration: 10 }),
    ...pulsatileCycles({ high: o.vessel + o.change / 2, low: o.vessel - o.change / 2, cycles: o.cycles }),
  ];
}
