/**
 * Material parameter sets, shared by the web app (forms), the API (validation) and fe-core
 * (constitutive updates). Units: MPa, mm, s, °C. One discriminated union on `model`.
 */
import { z } from 'zod';

const positive = (what: string) => z.number({ error: `${what} must be a number` }).positive({ error: `${what} must be > 0` });
const finite = (what: string) => z.number({ error: `${what} must be a number` }).finite();
const poisson = z.number().gt(-1, { error: 'nu must be > -1' }).lt(0.5, { error: 'nu must be < 0.5' });

export const linearElasticSchema = z.object({
  model: z.literal('linear-elastic'),
  E: positive('E (Young modulus, MPa)'),
  nu: poisson,
  alpha: finite('alpha (thermal expansion, 1/°C)').default(0),
  /** Temperature at which thermal strain is zero (°C). */
  T_ref: finite('T_ref').default(20),
});

export const j2PlasticSchema = z.object({
  model: z.literal('j2-plastic'),
  E: positive('E (Young modulus, MPa)'),
  nu: poisson,
  alpha: finite('alpha').default(0),
  T_ref: finite('T_ref').default(20),
  sigma_y: positive('sigma_y (initial yield stress, MPa)'),
  /** Linear isotropic hardening modulus (MPa). */
  H_iso: z.number().min(0).default(0),
  /** Linear kinematic hardening modulus (MPa). */
  H_kin: z.number().min(0).default(0),
});

// --- SMA blocks: messages say whether a value is missing or not a number, and name the field.
const smaNumber = (what: string) =>
  z.number({ error: (iss) => (iss.input === undefined ? `${what} is required` : `${what} must be a number`) });
const smaPositive = (what: string) => smaNumber(what).positive({ error: `${what} must be > 0` });
const smaFinite = (what: string) => smaNumber(what).finite({ error: `${what} must be finite` });
const smaPoisson = smaNumber('nu (Poisson ratio)')
  .gt(-1, { error: 'nu must be > -1' })
  .lt(0.5, { error: 'nu must be < 0.5' });
const smaExponent = (what: string) =>
  smaNumber(what).gt(0, { error: `${what} must be > 0` }).max(1, { error: `${what} must be ≤ 1` }).default(1);

/**
 * Phase-fraction model, Lagoudas et al. (2012), with inputs as a lab measures them.
 * T_ref is the temperature of zero thermal strain. With k_t = 0 the transformation strain is
 * H_min at every stress (set H_min = H_sat for a constant one). Orderings (Mf0 < Ms0,
 * As0 < Af0, As0 + Af0 > Ms0 + Mf0, similar C_M and C_A) are checked by the calibration in
 * fe-core, which names the measured quantity to fix.
 */
export const lagoudas2012Schema = z.object({
  model: z.literal('lagoudas2012'),
  E_A: smaPositive('E_A (austenite modulus, MPa)'),
  E_M: smaPositive('E_M (martensite modulus, MPa)'),
  nu: smaPoisson,
  alpha_A: smaFinite('alpha_A (austenite thermal expansion, 1/°C)').default(0),
  alpha_M: smaFinite('alpha_M (martensite thermal expansion, 1/°C)').default(0),
  T_ref: smaFinite('T_ref (°C, zero thermal strain)').default(20),
  Ms0: smaFinite('Ms0 (°C)'),
  Mf0: smaFinite('Mf0 (°C)'),
  As0: smaFinite('As0 (°C)'),
  Af0: smaFinite('Af0 (°C)'),
  C_M: smaPositive('C_M (MPa/°C)'),
  C_A: smaPositive('C_A (MPa/°C)'),
  sigma_star: smaPositive('sigma_star (calibration stress, MPa)'),
  H_min: smaNumber('H_min').min(0, { error: 'H_min must be ≥ 0' }).max(0.2, { error: 'H_min must be ≤ 0.2' }),
  H_sat: smaPositive('H_sat (saturated transformation strain)').max(0.2, { error: 'H_sat must be ≤ 0.2' }),
  k_t: smaNumber('k_t (1/MPa)').min(0, { error: 'k_t must be ≥ 0' }),
  n1: smaExponent('n1'),
  n2: smaExponent('n2'),
  n3: smaExponent('n3'),
  n4: smaExponent('n4'),
  /** Optional J2 plastic strain: yield stresses of austenite and martensite (MPa), mixed linearly by ξ, linear isotropic hardening H_iso (MPa). */
  plasticity: z
    .object({ sigma_y_A: smaPositive('sigma_y_A'), sigma_y_M: smaPositive('sigma_y_M'), H_iso: z.number().min(0).default(0) })
    .optional(),
});

/** Range of tc_ratio reachable with lode_shape γ (Bigoni–Piccolroaz β from 0 to 2). */
export function souzaTcRatioRange(lodeShape: number): [number, number] {
  const a = Math.acos(lodeShape);
  const hi = Math.cos(a / 3) / Math.cos((Math.PI - a) / 3);
  return [1 / hi, hi];
}

/**
 * Transformation-strain model, Souza et al. (1998) / Auricchio & Petrini (2002, 2004).
 * τ(T) = beta·max(T − T0, 0); eps_L bounds the norm of the transformation strain tensor (the
 * uniaxial transformation strain saturates at √(2/3)·eps_L); T_ref is the temperature of zero
 * thermal strain.
 *
 * Tension–compression asymmetry (Lode-angle gauge of Bigoni & Piccolroaz 2004 on the
 * transformation strain): tc_ratio = r is the ratio of the maximum uniaxial transformation strains
 * tension/compression, which is also the ratio of the stress–temperature slopes
 * compression/tension; uniaxial tension keeps the symmetric closed forms, uniaxial compression
 * starts at √(3/2)(R + r·τ), saturates at √(3/2)(R + r·τ + r·h·eps_L) with transformation strain
 * √(2/3)·eps_L/r. lode_shape = γ in [0, 1) sets how the shape varies with the Lode angle and bounds
 * r (see souzaTcRatioRange); r = 1, γ = 0 is the symmetric model. The former single `asymmetry`
 * number is still read when it is 0.
 */
export const souzaAuricchioSchema = z.object({
  model: z.literal('souza-auricchio'),
  E: smaPositive('E (MPa)'),
  nu: smaPoisson,
  alpha: smaFinite('alpha (thermal expansion, 1/°C)').default(0),
  T_ref: smaFinite('T_ref (°C, zero thermal strain)').default(20),
  h: smaPositive('h (hardening, MPa)'),
  beta: smaPositive('beta (MPa/°C)'),
  T0: smaFinite('T0 (°C, temperature where the driving threshold vanishes)'),
  R: smaPositive('R (elastic domain radius, MPa)'),
  eps_L: smaPositive('eps_L (maximum transformation strain norm)').max(0.2, { error: 'eps_L must be ≤ 0.2' }),
  /** Default 1 (symmetric); optional so parameter sets written before it stay valid as they are. */
  tc_ratio: smaPositive('tc_ratio (tension/compression ratio of the maximum transformation strain)')
    .optional()
    .describe('Tension/compression ratio of the maximum uniaxial transformation strain (= compression/tension ratio of the stress–temperature slopes); default 1 (symmetric).'),
  /** Default 0 (no Lode-angle dependence). */
  lode_shape: smaNumber('lode_shape (Lode-angle shape γ)')
    .min(0, { error: 'lode_shape must be ≥ 0' })
    .lt(1, { error: 'lode_shape must be < 1' })
    .optional()
    .describe('Lode-angle shape γ (Bigoni–Piccolroaz 2004), 0 ≤ γ < 1; bounds the reachable tc_ratio; default 0.'),
  /** Superseded by tc_ratio and lode_shape; only 0 (symmetric) is accepted. */
  asymmetry: smaNumber('asymmetry')
    .refine((v: number): boolean => v === 0, { error: 'asymmetry is replaced by tc_ratio and lode_shape: remove it (or set 0) and give those instead' })
    .optional(),
}).superRefine((m, ctx) => {
  const ratio = m.tc_ratio ?? 1;
  const shape = m.lode_shape ?? 0;
  const [lo, hi] = souzaTcRatioRange(shape);
  if (ratio < lo * (1 - 1e-12) || ratio > hi * (1 + 1e-12)) {
    ctx.addIssue({
      code: 'custom',
      path: ['tc_ratio'],
      message: `tc_ratio must lie in [${lo.toPrecision(4)}, ${hi.toPrecision(4)}] with lode_shape ${shape}; a larger lode_shape widens the range`,
    });
  }
});

export const materialParamsSchema = z.discriminatedUnion('model', [
  linearElasticSchema,
  j2PlasticSchema,
  lagoudas2012Schema,
  souzaAuricchioSchema,
]);

export type LinearElasticParams = z.infer<typeof linearElasticSchema>;
export type J2PlasticParams = z.infer<typeof j2PlasticSchema>;
export type Lagoudas2012Params = z.infer<typeof lagoudas2012Schema>;
export type SouzaAuricchioParams = z.infer<typeof souzaAuricchioSchema>;
export type MaterialParams = z.infer<typeof materialParamsSchema>;
export type MaterialModelName = MaterialParams['model'];
