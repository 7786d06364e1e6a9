/**
 * Parameters of the parametric model templates (template = parametric geometry + mesh
 * generator, see fe-core `templates/`). The web app generates its forms from these schemas, so
 * they stay flat: numbers (unit in `.describe()`), enums, booleans, plus a `history` list of
 * template segments. Every bound refuses nonsense with a message that names the field.
 *
 * Units: mm, N, MPa, s, °C (as in the model format). Defaults are demo values.
 */
import { z } from 'zod';

const num = (field: string) =>
  z.number({ error: (iss) => (iss.input === undefined ? `${field} is required` : `${field} must be a number`) }).finite({ error: `${field} must be finite` });
const length = (field: string, fallback: number, what: string) =>
  num(field).positive({ error: `${field} must be > 0 mm` }).default(fallback).describe(`mm · ${what}`);
const count = (field: string, fallback: number, min: number, max: number, what: string) =>
  num(field)
    .int({ error: `${field} must be a whole number` })
    .min(min, { error: `${field} must be ≥ ${min}` })
    .max(max, { error: `${field} must be ≤ ${max}` })
    .default(fallback)
    .describe(`count · ${what}`);
const temperature = (field: string, fallback: number, what: string) =>
  num(field).min(-273.15, { error: `${field} must be above absolute zero (−273.15 °C)` }).default(fallback).describe(`°C · ${what}`);

/**
 * One piece of a template's history. `load` is the end value of the template's driving quantity
 * (its meaning and unit are given by the template: strain in %, force in N, deflection in mm,
 * ring diameter in mm, remote stress in MPa); omitted = unchanged. `temperature` likewise.
 */
export const templateSegmentSchema = z.object({
  name: z.string({ error: 'segment name must be text' }).min(1, { error: 'segment name must not be empty' }).describe('text · shown in progress and results'),
  duration: num('duration').positive({ error: 'duration must be > 0 s' }).default(1).describe('s · analysis time of the segment'),
  load: num('load').optional().describe("template unit · end value of the template's driving quantity"),
  temperature: num('temperature').min(-273.15, { error: 'temperature must be above absolute zero (−273.15 °C)' }).optional().describe('°C · temperature at the end'),
  increments: num('increments')
    .int({ error: 'increments must be a whole number' })
    .min(1, { error: 'increments must be ≥ 1' })
    .max(5000, { error: 'increments must be ≤ 5000' })
    .default(20)
    .describe('count · at least this many increments (about 20 or more across a transformation)'),
});
export type TemplateSegment = z.infer<typeof templateSegmentSchema>;
export type TemplateSegmentInput = z.input<typeof templateSegmentSchema>;

const history = (fallback: TemplateSegmentInput[]) =>
  z
    .array(templateSegmentSchema)
    .min(1, { error: 'history needs at least one segment' })
    .max(2000, { error: 'history must have ≤ 2000 segments' })
    .default(fallback.map((s) => templateSegmentSchema.parse(s)))
    .describe('segments · the load–temperature history');

const ELEMENT_2D = ['q4-eas', 'q8'] as const;

// ---------------------------------------------------------------------------------------------
// Tensile coupon (ASTM F2516-like load/unload): wire or tube as a bar, or a strip dogbone.

export const tensileCouponParamsSchema = z
  .object({
    template: z.literal('tensile-coupon'),
    form: z.enum(['wire', 'tube', 'strip']).default('wire').describe('choice · wire or tube (bar elements) or flat strip dogbone (plane stress)'),
    gaugeLength: length('gaugeLength', 25, 'length over which strain is measured (wire/tube: whole bar)'),
    diameter: length('diameter', 0.5, 'wire diameter or tube outer diameter'),
    wallThickness: length('wallThickness', 0.1, 'tube wall thickness'),
    barElements: count('barElements', 4, 1, 1000, 'bar elements along the wire/tube'),
    gaugeWidth: length('gaugeWidth', 2, 'strip width in the gauge section'),
    gripWidth: length('gripWidth', 4, 'strip width at the grips'),
    gripLength: length('gripLength', 5, 'strip length of each grip end'),
    filletRadius: length('filletRadius', 3, 'strip fillet radius between gauge and grip'),
    thickness: length('thickness', 0.5, 'strip thickness'),
    elementType: z.enum(ELEMENT_2D).default('q4-eas').describe('choice · strip elements (Q4 with enhanced strains, or 8-node quadratic)'),
    cellsAcross: count('cellsAcross', 2, 1, 200, 'strip elements across half the gauge width'),
    testTemperature: temperature('testTemperature', 37, 'test temperature'),
    peakStrain: num('peakStrain').positive({ error: 'peakStrain must be > 0 %' }).max(20, { error: 'peakStrain must be ≤ 20 %' }).default(6).describe('% · peak strain of the presets (ASTM F2516 loads to 6 %)'),
    history: history([
      { name: 'load to 6 %', load: 6, increments: 60 },
      { name: 'unload', load: 0, increments: 60 },
    ]),
  })
  .refine((p) => p.form !== 'tube' || 2 * p.wallThickness < p.diameter, { error: 'wallThickness must be less than half the diameter', path: ['wallThickness'] })
  .refine((p) => p.form !== 'strip' || p.gripWidth > p.gaugeWidth, { error: 'gripWidth must be larger than gaugeWidth', path: ['gripWidth'] })
  .refine((p) => p.form !== 'strip' || p.filletRadius >= (p.gripWidth - p.gaugeWidth) / 2, {
    error: 'filletRadius must be at least half the difference of gripWidth and gaugeWidth',
    path: ['filletRadius'],
  });

// ---------------------------------------------------------------------------------------------
// Actuator wire: constant weight, heated and cooled; optional linear bias spring.

export const actuatorWireParamsSchema = z
  .object({
    template: z.literal('actuator-wire'),
    length: length('length', 100, 'wire length'),
    diameter: length('diameter', 0.25, 'wire diameter'),
    barElements: count('barElements', 4, 1, 1000, 'bar elements along the wire'),
    weight: num('weight').min(0, { error: 'weight must be ≥ 0 N' }).default(7).describe('N · hanging weight held during the thermal cycles (used by the presets; the history sets the applied value)'),
    biasSpring: z.boolean().default(false).describe('yes/no · a linear spring that pulls back as the wire stretches'),
    springStiffness: num('springStiffness').positive({ error: 'springStiffness must be > 0 N/mm' }).default(1).describe('N/mm · bias spring stiffness'),
    springPreload: num('springPreload').min(0, { error: 'springPreload must be ≥ 0 N' }).default(0).describe('N · bias spring force on the wire at the start'),
    highTemperature: temperature('highTemperature', 110, 'hot end of the cycle'),
    lowTemperature: temperature('lowTemperature', 20, 'cold end of the cycle'),
    cycles: count('cycles', 1, 1, 100, 'thermal cycles of the preset'),
    history: history([
      { name: 'hang weight', load: 7, increments: 4 },
      { name: 'cool', temperature: 20, duration: 60, increments: 180 },
      { name: 'heat', temperature: 110, duration: 60, increments: 180 },
    ]),
  })
  .refine((p) => p.lowTemperature < p.highTemperature, { error: 'lowTemperature must be below highTemperature', path: ['lowTemperature'] });

// ---------------------------------------------------------------------------------------------
// Wire bending: fibre beam, three-point bending or cantilever.

export const wireBendingParamsSchema = z.object({
  template: z.literal('wire-bending'),
  layout: z.enum(['three-point', 'cantilever']).default('three-point').describe('choice · simply supported with a central load, or clamped with a tip load'),
  span: length('span', 20, 'distance between supports (cantilever: free length)'),
  diameter: length('diameter', 0.5, 'wire diameter'),
  beamElements: count('beamElements', 20, 2, 2000, 'beam elements along the span'),
  theory: z.enum(['euler-bernoulli', 'timoshenko']).default('euler-bernoulli').describe('choice · beam theory'),
  fibres: count('fibres', 16, 1, 200, 'layers through the depth'),
  testTemperature: temperature('testTemperature', 37, 'test temperature'),
  history: history([
    { name: 'deflect', load: 1, increments: 40 },
    { name: 'release', load: 0, increments: 40 },
  ]),
});

// ---------------------------------------------------------------------------------------------
// Stent strut cell: half of a V (one strut and half its crown) in plane stress.

export const stentStrutParamsSchema = z
  .object({
    template: z.literal('stent-strut'),
    strutWidth: length('strutWidth', 0.12, 'strut width in the cut pattern'),
    thickness: length('thickness', 0.2, 'wall thickness of the tube'),
    strutLength: length('strutLength', 1.6, 'straight strut length'),
    openingAngle: num('openingAngle').min(0, { error: 'openingAngle must be ≥ 0°' }).lt(150, { error: 'openingAngle must be < 150°' }).default(40).describe('° · angle between the two struts of the V'),
    crownRadius: length('crownRadius', 0.15, 'inner radius of the crown'),
    crownsPerRing: count('crownsPerRing', 10, 3, 100, 'V units around the ring'),
    expandedDiameter: length('expandedDiameter', 8, 'ring diameter of the stress-free (shape-set) cell'),
    crimpedDiameter: length('crimpedDiameter', 7, 'ring diameter when crimped'),
    vesselDiameter: length('vesselDiameter', 7.6, 'ring diameter after release in the vessel'),
    pulsatileChange: num('pulsatileChange').min(0, { error: 'pulsatileChange must be ≥ 0 mm' }).default(0.06).describe('mm · diastolic-to-systolic change of the diameter'),
    crimpTemperature: temperature('crimpTemperature', 20, 'temperature during crimping'),
    bodyTemperature: temperature('bodyTemperature', 37, 'temperature in the body'),
    pulsatileCycles: count('pulsatileCycles', 3, 1, 200, 'pulsatile cycles of the preset'),
    elementType: z.enum(ELEMENT_2D).default('q4-eas').describe('choice · element type'),
    cellsAcross: count('cellsAcross', 3, 1, 50, 'elements across the strut width'),
    cellsAlongStrut: count('cellsAlongStrut', 16, 1, 1000, 'elements along the strut'),
    cellsAroundCrown: count('cellsAroundCrown', 8, 1, 1000, 'elements around the half crown'),
    history: history([
      { name: 'crimp', load: 7, increments: 40 },
      { name: 'release', load: 7.6, increments: 40 },
      { name: 'body temperature', temperature: 37, increments: 10 },
      { name: 'systole 1', load: 7.63, increments: 10 },
      { name: 'diastole 1', load: 7.57, increments: 10 },
    ]),
  })
  .refine((p) => p.crimpedDiameter < p.expandedDiameter, { error: 'crimpedDiameter must be smaller than expandedDiameter', path: ['crimpedDiameter'] })
  .refine((p) => p.vesselDiameter >= p.crimpedDiameter && p.vesselDiameter <= p.expandedDiameter, {
    error: 'vesselDiameter must lie between crimpedDiameter and expandedDiameter',
    path: ['vesselDiameter'],
  })
  .refine((p) => p.pulsatileChange < p.expandedDiameter - p.crimpedDiameter, { error: 'pulsatileChange must be smaller than the crimp range', path: ['pulsatileChange'] })
  .refine((p) => crimpClosing(p) < strutSpan(p), {
    error: 'crimpedDiameter: crimping would close the V further than the strut spans around the ring; raise crimpedDiameter or crownsPerRing',
    path: ['crimpedDiameter'],
  });

/** Circumferential travel of one strut end (mm) for a ring diameter change D0 − D. */
export function strutEndTravel(p: { expandedDiameter: number; crownsPerRing: number }, diameter: number): number {
  // A ring of N V units has 2N struts; each strut end takes its share of the circumference.
  return (Math.PI * (diameter - p.expandedDiameter)) / (2 * p.crownsPerRing);
}
function crimpClosing(p: { expandedDiameter: number; crimpedDiameter: number; crownsPerRing: number }): number {
  return -strutEndTravel(p, p.crimpedDiameter);
}
function strutSpan(p: { strutLength: number; openingAngle: number }): number {
  return p.strutLength * Math.sin((p.openingAngle * Math.PI) / 360);
}

// ---------------------------------------------------------------------------------------------
// Plate with a hole (verification against Kirsch): quarter model under remote tension.

export const plateWithHoleParamsSchema = z
  .object({
    template: z.literal('plate-with-hole'),
    holeDiameter: length('holeDiameter', 2, 'hole diameter'),
    plateWidth: length('plateWidth', 40, 'plate width (across the load)'),
    plateHeight: length('plateHeight', 40, 'plate height (along the load)'),
    thickness: length('thickness', 1, 'plate thickness'),
    elementType: z.enum(['q8', 'q4-eas', 'q4', 't6', 't3']).default('q8').describe('choice · element type'),
    cellsAround: count('cellsAround', 8, 1, 500, 'elements around each eighth of the hole'),
    cellsRadial: count('cellsRadial', 12, 1, 500, 'elements from the hole to the edge'),
    grading: num('grading').min(1, { error: 'grading must be ≥ 1' }).max(1000, { error: 'grading must be ≤ 1000' }).default(20).describe('ratio · outer element size ÷ element size at the hole'),
    temperature: temperature('temperature', 20, 'uniform temperature'),
    history: history([{ name: 'remote tension', load: 100, increments: 1 }]),
  })
  .refine((p) => p.plateWidth > p.holeDiameter, { error: 'plateWidth must be larger than holeDiameter', path: ['plateWidth'] })
  .refine((p) => p.plateHeight > p.holeDiameter, { error: 'plateHeight must be larger than holeDiameter', path: ['plateHeight'] });

export const templateParamsSchema = z.discriminatedUnion('template', [
  tensileCouponParamsSchema,
  actuatorWireParamsSchema,
  wireBendingParamsSchema,
  stentStrutParamsSchema,
  plateWithHoleParamsSchema,
]);

export type TensileCouponParams = z.infer<typeof tensileCouponParamsSchema>;
export type ActuatorWireParams = z.infer<typeof actuatorWireParamsSchema>;
export type WireBendingParams = z.infer<typeof wireBendingParamsSchema>;
export type StentStrutParams = z.infer<typeof stentStrutParamsSchema>;
export type PlateWithHoleParams = z.infer<typeof plateWithHoleParamsSchema>;
export type TemplateParams = z.infer<typeof templateParamsSchema>;
export type TemplateParamsInput = z.input<typeof templateParamsSchema>;
export type TemplateName = TemplateParams['template'];
export const TEMPLATE_NAMES = ['tensile-coupon', 'actuator-wire', 'wire-bending', 'stent-strut', 'plate-with-hole'] as const satisfies readonly TemplateName[];
