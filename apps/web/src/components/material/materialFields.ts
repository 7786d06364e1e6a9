/**
 * Form fields of a material model, read from the shared zod schema (packages/shared materials.ts),
 * so the form follows the schema the API validates with: which keys exist, which are required,
 * which have defaults, nested groups such as the optional Lagoudas plasticity. The schema's own
 * messages ("E_A (austenite modulus, MPa) …") give each field's hint; units come from UNITS below
 * because the schema states them only inside those sentences.
 */
import { materialParamsSchema, type MaterialModelName, type MaterialParams } from '@phaseloop/shared';

/** The part of zod's runtime shape we read; structural, so the web app does not import zod itself. */
interface SchemaNode {
  description?: string;
  safeParse(input: unknown): { success: boolean; error?: { issues: { message: string }[] } };
  _zod: { def: { type: string; innerType?: SchemaNode; shape?: Record<string, SchemaNode> } };
}

export interface MaterialField {
  /** Dotted path inside the parameter set, e.g. "E_A" or "plasticity.sigma_y_A". */
  key: string;
  /** Unit in Phaseloop's fixed system (MPa, mm, s, °C); "–" for ratios and exponents. */
  unit: string;
  hint: string;
  /** The schema has neither a default nor allows leaving it out. */
  required: boolean;
  /** Name of the optional group the field belongs to ("plasticity"), or "" for top-level fields. */
  group: string;
}

/** Units of every parameter name the shared material schemas use. */
const UNITS: Record<string, string> = {
  E: 'MPa', E_A: 'MPa', E_M: 'MPa', sigma_y: 'MPa', H_iso: 'MPa', H_kin: 'MPa', sigma_star: 'MPa', h: 'MPa', R: 'MPa',
  sigma_y_A: 'MPa', sigma_y_M: 'MPa',
  alpha: '1/°C', alpha_A: '1/°C', alpha_M: '1/°C',
  T_ref: '°C', Ms0: '°C', Mf0: '°C', As0: '°C', Af0: '°C', T0: '°C',
  C_M: 'MPa/°C', C_A: 'MPa/°C', beta: 'MPa/°C',
  k_t: '1/MPa',
};

/**
 * Keys the schema still reads from older parameter sets but no one should enter any more
 * (Souza–Auricchio `asymmetry`, replaced by `tc_ratio` and `lode_shape`; only 0 is accepted).
 */
const SUPERSEDED = new Set(['asymmetry']);

export function unitOf(key: string): string {
  return UNITS[key.split('.').pop() ?? key] ?? '–';
}

const WRAPPERS = new Set(['default', 'optional', 'nullable', 'prefault']);

function unwrap(node: SchemaNode): { inner: SchemaNode; required: boolean } {
  let current = node;
  let required = true;
  while (WRAPPERS.has(current._zod.def.type) && current._zod.def.innerType) {
    required = false;
    current = current._zod.def.innerType;
  }
  return { inner: current, required };
}

/**
 * "E_A (austenite modulus, MPa) must be a number" → "austenite modulus"; the unit and the key are
 * dropped because the form shows them already. A `.describe()` text wins when the schema has one.
 */
export function hintFromSchema(key: string, node: SchemaNode): string {
  if (node.description) return node.description;
  const message = node.safeParse('not a number').error?.issues[0]?.message ?? '';
  const inside = new RegExp(`^${key.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')} \\(([^)]*)\\)`).exec(message)?.[1] ?? '';
  const unit = unitOf(key);
  return inside.split(',').map((part) => part.trim()).filter((part) => part !== '' && part !== unit).join(', ');
}

function modelSchema(model: string): SchemaNode | null {
  const option = materialParamsSchema.options.find((o) => o.shape.model.value === model);
  return (option as unknown as SchemaNode | undefined) ?? null;
}

export const MATERIAL_MODELS: MaterialModelName[] = materialParamsSchema.options.map((o) => o.shape.model.value);

/** Fields of one model in schema order; an unknown model has none. */
export function materialFields(model: string): MaterialField[] {
  const shape = modelSchema(model)?._zod.def.shape ?? {};
  const fields: MaterialField[] = [];
  for (const [key, node] of Object.entries(shape)) {
    if (key === 'model' || SUPERSEDED.has(key)) continue;
    const { inner, required } = unwrap(node);
    if (inner._zod.def.type === 'number') {
      fields.push({ key, unit: unitOf(key), hint: hintFromSchema(key, node), required, group: '' });
    } else if (inner._zod.def.type === 'object') {
      for (const [sub, subNode] of Object.entries(inner._zod.def.shape ?? {})) {
        const nested = unwrap(subNode);
        if (nested.inner._zod.def.type !== 'number') continue;
        fields.push({ key: `${key}.${sub}`, unit: unitOf(sub), hint: hintFromSchema(sub, subNode), required: nested.required, group: key });
      }
    }
  }
  return fields;
}

export type FlatValues = Record<string, number | undefined>;

/** Parameter set → form values keyed by dotted path (numbers only; other keys are not edited here). */
export function flattenParams(params: Record<string, unknown>, prefix = ''): FlatValues {
  const out: FlatValues = {};
  for (const [key, value] of Object.entries(params)) {
    if (typeof value === 'number') out[prefix + key] = value;
    else if (value && typeof value === 'object' && !Array.isArray(value)) Object.assign(out, flattenParams(value as Record<string, unknown>, `${prefix}${key}.`));
  }
  return out;
}

/**
 * Form values → parameter set for the API. Empty fields are left out (the schema fills defaults or
 * names the missing field); an optional group with every field empty is left out as a whole.
 */
export function buildParams(model: string, values: FlatValues): MaterialParams {
  const out: Record<string, unknown> = { model };
  for (const field of materialFields(model)) {
    const value = values[field.key];
    if (value === undefined || Number.isNaN(value)) continue;
    if (field.group) {
      const [group, sub] = field.key.split('.') as [string, string];
      const target = (out[group] ??= {}) as Record<string, number>;
      target[sub] = value;
    } else {
      out[field.key] = value;
    }
  }
  // The API parses this with the same schema; until then it is only the shape we send.
  return out as unknown as MaterialParams;
}

/** API validation details ("params.E_A: …") → messages by form key ("E_A"); the rest under "". */
export function errorsByField(details: unknown, prefix = 'params.'): Record<string, string> {
  const out: Record<string, string> = {};
  if (!Array.isArray(details)) return out;
  for (const item of details as { path?: unknown; message?: unknown }[]) {
    if (typeof item?.message !== 'string') continue;
    const path = typeof item.path === 'string' ? item.path : '';
    const key = path.startsWith(prefix) ? path.slice(prefix.length) : path;
    out[key] ??= item.message;
  }
  return out;
}
