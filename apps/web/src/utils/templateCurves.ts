/**
 * The template's own curves (force–displacement, ξ–temperature, stroke–temperature …) of a run,
 * from its frozen study definition and the result history. Shared by the results page and the
 * printed run report so both plot the same thing.
 */
import { templates } from '@phaseloop/fe-core/templates/index';
import { TEMPLATE_NAMES, type TemplateName } from '@phaseloop/shared';

export interface HistoryCurve {
  title: string;
  xLabel: string;
  yLabel: string;
  points: [number, number][];
}

/** The study definition frozen into a run's snapshot, or undefined when the snapshot has none. */
export function snapshotDefinition(snapshot: Record<string, unknown> | undefined): Record<string, unknown> | undefined {
  const study = snapshot?.study;
  if (typeof study !== 'object' || study === null) return undefined;
  const definition = (study as { definition?: unknown }).definition;
  return typeof definition === 'object' && definition !== null ? (definition as Record<string, unknown>) : undefined;
}

export function isTemplateName(name: unknown): name is TemplateName {
  return typeof name === 'string' && (TEMPLATE_NAMES as readonly string[]).includes(name);
}

/** Curves of the definition's template over the history; none for mesh or model-only studies. */
export function templateCurves(definition: Record<string, unknown> | undefined, history: Record<string, number[]> | undefined): HistoryCurve[] {
  const name = definition?.template;
  if (!history || !isTemplateName(name)) return [];
  try {
    return templates[name].curves(definition?.params).flatMap((c) => {
      const xs = history[c.x.key];
      const ys = history[c.y.key];
      if (!xs || !ys) return [];
      const points = xs.map((x, k) => [x * c.x.scale + (c.x.offset ?? 0), ys[k]! * c.y.scale + (c.y.offset ?? 0)] as [number, number]);
      return [{ title: c.title, xLabel: `${c.x.label} (${c.x.unit})`, yLabel: `${c.y.label} (${c.y.unit})`, points }];
    });
  } catch {
    // Parameters the template no longer accepts: the page still shows everything else.
    return [];
  }
}
