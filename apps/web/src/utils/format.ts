/** Display helpers shared by the tables. Dates show in the browser's locale and time zone. */

const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
const dateOnly = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });

function toDate(value: string | null | undefined): Date | null {
  if (!value) return null;
  const date = new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

export function formatDateTime(value: string | null | undefined, empty = '—'): string {
  const date = toDate(value);
  return date ? dateTime.format(date) : empty;
}

export function formatDate(value: string | null | undefined, empty = '—'): string {
  const date = toDate(value);
  return date ? dateOnly.format(date) : empty;
}

/** Elapsed time between two instants as "1 h 02 min", "3 min 05 s" or "12 s". */
export function formatDuration(from: string | null | undefined, to: string | null | undefined): string {
  const start = toDate(from);
  const end = toDate(to);
  if (!start || !end) return '—';
  const seconds = Math.max(0, Math.round((end.getTime() - start.getTime()) / 1000));
  const h = Math.floor(seconds / 3600);
  const m = Math.floor((seconds % 3600) / 60);
  const s = seconds % 60;
  const pad = (n: number) => String(n).padStart(2, '0');
  if (h > 0) return `${h} h ${pad(m)} min`;
  if (m > 0) return `${m} min ${pad(s)} s`;
  return `${s} s`;
}

/** Published model names as Phaseloop writes them; unknown keys are shown as sent. */
const MODEL_LABELS: Record<string, string> = {
  'linear-elastic': 'Linear elastic',
  'j2-plastic': 'J2 plasticity',
  lagoudas2012: 'Lagoudas 2012',
  'souza-auricchio': 'Souza–Auricchio',
  souzaAuricchio: 'Souza–Auricchio',
};

export function modelLabel(model: string): string {
  return MODEL_LABELS[model] ?? model;
}

/** Turns machine keys like "stent-strut" or "tensile_coupon" into "Stent strut" / "Tensile coupon". */
export function humanize(key: string | null | undefined): string {
  if (!key) return '—';
  const words = key.replace(/[-_]+/g, ' ').replace(/([a-z])([A-Z])/g, '$1 $2').trim().toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Names an actor or author given as a plain string or as a small user object. */
export function personName(value: string | { name?: string; email?: string } | null | undefined): string {
  if (!value) return '—';
  if (typeof value === 'string') return value;
  return value.name || value.email || '—';
}

/** File sizes in binary steps, as file managers show them: "812 B", "14.2 KiB", "3.1 MiB". */
export function formatBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return '—';
  if (bytes < 1024) return `${bytes} B`;
  const units = ['KiB', 'MiB', 'GiB'];
  let value = bytes / 1024;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit += 1;
  }
  return `${value.toFixed(value < 10 ? 1 : 0)} ${units[unit]}`;
}
