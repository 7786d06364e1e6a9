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

/** Phase-fraction model, Lagoudas et al. (2012), with inputs as a lab measures them. */
export const lagoudas2012Schema = z.object({
  model: z.literal('lagoudas2012'),
  E_A: positive('E_A (austenite modulus, MPa)'),
  E_M: positive('E_M (martensite modulus, MPa)'),
  nu: poisson,
  alpha_A: finite('alpha_A').default(0),
  alpha_M: finite('alpha_M').default(0),
  T_ref: finite('T_ref').default(20),
  Ms0: finite('Ms0 (°C)'),
  Mf0: finite('Mf0 (°C)'),
  As0: finite('As0 (°C)'),
  Af0: finite('Af0 (°C)'),
  C_M: positive('C_M (MPa/°C)'),
  C_A: positive('C_A (MPa/°C)'),
  sigma_star: positive('sigma_star (calibration stress, MPa)'),
  H_min: z.number().min(0, { error: 'H_min must be ≥ 0' }),
  H_sat: positive('H_sat (saturated transformation strain)'),
  k_t: z.number().min(0, { error: 'k_t must be ≥ 0' }),
  n1: z.number().gt(0).max(1).default(1),
  n2: z.number().gt(0).max(1).default(1),
  n3: z.number().gt(0).max(1).default(1),
  n4: z.number().gt(0).max(1).default(1),
  /** Optional J2 plastic strain: yield stresses of austenite and martensite (MPa), mixed by ξ. */
  plasticity: z
    .object({ sigma_y_A: positive('sigma_y_A'), sigma_y_M: positive('sigma_y_M'), H_iso: z.number().min(0).default(0) })
    .optional(),
});

/** Transformation-strain model, Souza et al. (1998) / Auricchio & Petrini (2002, 2004). */
export const souzaAuricchioSchema = z.object({
  model: z.literal('souza-auricchio'),
  E: positive('E (MPa)'),
  nu: poisson,
  alpha: finite('alpha').default(0),
  T_ref: finite('T_ref').default(20),
  h: positive('h (hardening, MPa)'),
  beta: positive('beta (MPa/°C)'),
  T0: finite('T0 (°C, temperature where the driving threshold vanishes)'),
  R: positive('R (elastic domain radius, MPa)'),
  eps_L: positive('eps_L (maximum transformation strain norm)'),
  /** Optional tension–compression asymmetry (Lode-angle term); 0 = symmetric. */
  asymmetry: z.number().min(0).lt(1).default(0),
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
