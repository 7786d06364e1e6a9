/**
 * Template registry: each parametric template by name with its parameter schema (from
 * @phaseloop/shared, for forms and validation), its model builder, size estimate, history
 * presets and the curves its results are plotted with.
 *
 *   const model = templates['tensile-coupon'].build({ template: 'tensile-coupon', form: 'wire' }, material);
 *   parseModel(model) → buildProblem → runAnalysis
 */
import type { MaterialParams, Model, TemplateName, TemplateSegment } from '@phaseloop/shared';
import {
  actuatorWireParamsSchema,
  plateWithHoleParamsSchema,
  stentStrutParamsSchema,
  tensileCouponParamsSchema,
  wireBendingParamsSchema,
  type ActuatorWireParams,
  type StentStrutParams,
  type TensileCouponParams,
  type WireBendingParams,
} from '@phaseloop/shared';
import { DEMO_ACTUATOR, DEMO_SUPERELASTIC, parseParams, type CurveSpec, type LoadQuantity, type MeshSize, type SizeEstimate } from './common';
import { actuatorWireCurves, buildActuatorWire, estimateActuatorWire } from './actuatorWire';
import { buildPlateWithHole, estimatePlateWithHole, PLATE_DEFAULT_MATERIAL, plateWithHoleCurves } from './plateWithHole';
import { isobaricThermalCycle, pseudoelasticCycle, shapeMemorySequence, stentHistory, tensileTestSequence } from './presets';
import { buildStentStrut, estimateStentStrut, stentStrutCurves } from './stentStrut';
import { buildTensileCoupon, estimateTensileCoupon, tensileCouponCurves } from './tensileCoupon';
import { buildWireBending, estimateWireBending, wireBendingCurves } from './wireBending';

export interface TemplatePreset {
  title: string;
  /** Segments for the given (validated or raw) template parameters. */
  segments(params: unknown): TemplateSegment[];
}

export interface TemplateDefinition {
  name: TemplateName;
  title: string;
  description: string;
  /** zod schema of the parameters (discriminated by `template`). */
  paramsSchema: typeof tensileCouponParamsSchema | typeof actuatorWireParamsSchema | typeof wireBendingParamsSchema | typeof stentStrutParamsSchema | typeof plateWithHoleParamsSchema;
  /** What `load` in the history means (and its value before the first segment). */
  load(params: unknown): LoadQuantity;
  /** Material used when `build` is given none (demo values, never a real alloy's data). */
  defaultMaterial: MaterialParams;
  /** Model document ready for parseModel/buildProblem; throws TemplateParamsError on bad parameters. */
  build(params: unknown, material?: MaterialParams): Model;
  estimateSize(params: unknown): SizeEstimate;
  presets: Record<string, TemplatePreset>;
  curves(params: unknown): CurveSpec[];
}

const coupon = (p: unknown) => parseParams<TensileCouponParams>(tensileCouponParamsSchema, p);
const actuator = (p: unknown) => parseParams<ActuatorWireParams>(actuatorWireParamsSchema, p);
const bending = (p: unknown) => parseParams<WireBendingParams>(wireBendingParamsSchema, p);
const stent = (p: unknown) => parseParams<StentStrutParams>(stentStrutParamsSchema, p);

/** Adds the history's increment count to a template's mesh size. */
function withIncrements(estimate: (params: unknown) => MeshSize, schema: TemplateDefinition['paramsSchema']): (params: unknown) => SizeEstimate {
  return (params) => {
    const { history } = parseParams<{ history: TemplateSegment[] }>(schema, params);
    return { ...estimate(params), increments: history.reduce((sum, s) => sum + s.increments, 0) };
  };
}

export const templates: Record<TemplateName, TemplateDefinition> = {
  'tensile-coupon': {
    name: 'tensile-coupon',
    title: 'Tensile coupon',
    description: 'Wire or tube as a bar, or a flat dogbone strip in plane stress (quarter model), pulled to a strain and released under displacement control.',
    paramsSchema: tensileCouponParamsSchema,
    load: () => ({ label: 'strain', unit: '%', initial: 0 }),
    defaultMaterial: DEMO_SUPERELASTIC,
    build: buildTensileCoupon,
    estimateSize: withIncrements(estimateTensileCoupon, tensileCouponParamsSchema),
    presets: {
      tensileTest: { title: 'Tension test: load to the peak strain (6 %) and unload (ASTM F2516 sequence)', segments: (p) => tensileTestSequence({ peak: coupon(p).peakStrain }) },
      pseudoelastic: { title: 'Pseudoelastic cycle at the test temperature', segments: (p) => pseudoelasticCycle({ peak: coupon(p).peakStrain, temperature: coupon(p).testTemperature }) },
    },
    curves: tensileCouponCurves,
  },
  'actuator-wire': {
    name: 'actuator-wire',
    title: 'Actuator wire',
    description: 'A wire carrying a constant weight, cooled and heated through its transformation; optional linear bias spring.',
    paramsSchema: actuatorWireParamsSchema,
    load: () => ({ label: 'weight', unit: 'N', initial: 0 }),
    defaultMaterial: DEMO_ACTUATOR,
    build: buildActuatorWire,
    estimateSize: withIncrements(estimateActuatorWire, actuatorWireParamsSchema),
    presets: {
      isobaric: {
        title: 'Isobaric thermal cycles: hang the weight hot, cool, heat',
        segments: (p) => {
          const a = actuator(p);
          return isobaricThermalCycle({ load: a.weight, low: a.lowTemperature, high: a.highTemperature, cycles: a.cycles });
        },
      },
      shapeMemory: {
        title: 'Shape-memory sequence: cool, load and unload cold, heat to recover, cool (needs a Souza–Auricchio material)',
        segments: (p) => {
          const a = actuator(p);
          return shapeMemorySequence({ peak: a.weight, low: a.lowTemperature, high: a.highTemperature });
        },
      },
    },
    curves: actuatorWireCurves,
  },
  'wire-bending': {
    name: 'wire-bending',
    title: 'Wire bending',
    description: 'A wire as a fibre beam in three-point bending or as a cantilever, deflected and released.',
    paramsSchema: wireBendingParamsSchema,
    load: () => ({ label: 'deflection', unit: 'mm', initial: 0 }),
    defaultMaterial: DEMO_SUPERELASTIC,
    build: buildWireBending,
    estimateSize: withIncrements(estimateWireBending, wireBendingParamsSchema),
    presets: {
      pseudoelastic: { title: 'Deflect by 5 % of the span and release', segments: (p) => pseudoelasticCycle({ peak: 0.05 * bending(p).span, increments: 40 }) },
    },
    curves: wireBendingCurves,
  },
  'stent-strut': {
    name: 'stent-strut',
    title: 'Stent strut cell',
    description: 'Half of a V-shaped strut unit (strut and crown) in plane stress with symmetry conditions: crimp, release, body temperature, pulsatile cycles.',
    paramsSchema: stentStrutParamsSchema,
    load: (p) => ({ label: 'ring diameter', unit: 'mm', initial: stent(p).expandedDiameter }),
    defaultMaterial: DEMO_SUPERELASTIC,
    build: buildStentStrut,
    estimateSize: withIncrements(estimateStentStrut, stentStrutParamsSchema),
    presets: {
      deployment: {
        title: 'Crimp → release → body temperature → pulsatile cycles',
        segments: (p) => {
          const s = stent(p);
          return stentHistory({ crimped: s.crimpedDiameter, vessel: s.vesselDiameter, change: s.pulsatileChange, bodyTemperature: s.bodyTemperature, cycles: s.pulsatileCycles });
        },
      },
    },
    curves: stentStrutCurves,
  },
  'plate-with-hole': {
    name: 'plate-with-hole',
    title: 'Plate with a hole (verification)',
    description: 'Quarter of a plate with a circular hole under remote tension; compare the hole-edge stress with Kirsch (3σ).',
    paramsSchema: plateWithHoleParamsSchema,
    load: () => ({ label: 'remote stress', unit: 'MPa', initial: 0 }),
    defaultMaterial: PLATE_DEFAULT_MATERIAL,
    build: buildPlateWithHole,
    estimateSize: withIncrements(estimatePlateWithHole, plateWithHoleParamsSchema),
    presets: {
      tension: { title: 'Remote tension of 100 MPa in one increment', segments: () => [{ name: 'remote tension', duration: 1, load: 100, increments: 1 }] },
    },
    curves: plateWithHoleCurves,
  },
};

export { TemplateParamsError, type CurveSpec, type CurveAxis, type LoadQuantity, type MeshSize, type SizeEstimate, type TemplateIssue } from './common';
export { DEMO_ACTUATOR, DEMO_SUPERELASTIC } from './common';
export * as presets from './presets';
