/**
 * Reads a template's flat zod parameter schema (packages/shared templates.ts) into form fields.
 * The schema is the single source: units and hints come from its `.describe()` text
 * ("mm · strut width"), choices from its enums, demo defaults from parsing `{ template }`.
 */

/** The small part of zod's public runtime shape we read; kept structural so the web app does not depend on zod directly. */
interface SchemaNode {
  description?: string;
  _zod: { def: { type: string; innerType?: SchemaNode; entries?: Record<string, string | number>; shape?: Record<string, SchemaNode> } };
}

export interface ParamsSchema {
  safeParse(input: unknown): { success: true; data: unknown } | { success: false; error: { issues: { path: PropertyKey[]; message: string }[] } };
}

export type FieldKind = 'number' | 'choice' | 'boolean';

export interface FormField {
  key: string;
  kind: FieldKind;
  /** Unit as the schema states it (mm, °C, s, count, °); empty for choices. */
  unit: string;
  hint: string;
  options: string[];
  integer: boolean;
}

function unwrap(node: SchemaNode): SchemaNode {
  let current = node;
  while (['default', 'optional', 'nullable', 'prefault'].includes(current._zod.def.type) && current._zod.def.innerType) {
    current = current._zod.def.innerType;
  }
  return current;
}

/** "mm · strut width" → unit "mm", hint "strut width"; units like "count" and "choice" are not shown as units. */
export function splitDescription(text: string | undefined): { unit: string; hint: string } {
  if (!text) return { unit: '', hint: '' };
  const [head, ...rest] = text.split(' · ');
  if (rest.length === 0) return { unit: '', hint: head ?? '' };
  const unit = head === 'choice' || head === 'text' || head === 'segments' ? '' : head === 'count' ? '–' : (head ?? '');
  return { unit, hint: rest.join(' · ') };
}

function descriptionOf(node: SchemaNode): string | undefined {
  let current: SchemaNode | undefined = node;
  while (current) {
    if (current.description) return current.description;
    current = current._zod.def.innerType;
  }
  return undefined;
}

/** Form fields of every scalar parameter; `template` (the discriminator) and `history` (own editor) are left out. */
export function formFields(schema: unknown): FormField[] {
  const shape = (schema as SchemaNode)._zod.def.shape ?? {};
  const fields: FormField[] = [];
  for (const [key, node] of Object.entries(shape)) {
    if (key === 'template' || key === 'history') continue;
    const inner = unwrap(node);
    const { unit, hint } = splitDescription(descriptionOf(node));
    const type = inner._zod.def.type;
    if (type === 'number') {
      fields.push({ key, kind: 'number', unit, hint, options: [], integer: unit === '–' });
    } else if (type === 'enum') {
      fields.push({ key, kind: 'choice', unit: '', hint, options: Object.values(inner._zod.def.entries ?? {}).map(String), integer: false });
    } else if (type === 'boolean') {
      fields.push({ key, kind: 'boolean', unit: '', hint, options: [], integer: false });
    }
  }
  return fields;
}

/** Messages by field: "strutWidth" → first message; history rows as "history.2.increments". */
export function issuesByField(schema: ParamsSchema, params: unknown): Record<string, string> {
  const result = schema.safeParse(params);
  if (result.success) return {};
  const out: Record<string, string> = {};
  for (const issue of result.error.issues) {
    const key = issue.path.map(String).join('.') || '(form)';
    out[key] ??= issue.message;
  }
  return out;
}

/** Demo defaults of a template: the schema fills every default when given only the discriminator. */
export function defaultParams(schema: ParamsSchema, template: string): Record<string, unknown> {
  const result = schema.safeParse({ template });
  if (!result.success) throw new Error(`template ${template} has no complete defaults`);
  return structuredClone(result.data as Record<string, unknown>);
}
