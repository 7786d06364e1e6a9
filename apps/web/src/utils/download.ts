/** Saves text or a data URL as a file through a temporary link (no server round trip). */
export function saveDataUrl(dataUrl: string, filename: string): void {
  const link = document.createElement('a');
  link.href = dataUrl;
  link.download = filename;
  document.body.appendChild(link);
  link.click();
  link.remove();
}

export function saveText(text: string, filename: string, type = 'text/csv'): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  saveDataUrl(url, filename);
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** CSV with a header row; numbers as JavaScript prints them (full precision, '.' decimal). */
export function toCsv(header: readonly string[], rows: readonly (readonly (number | string | null)[])[]): string {
  const cell = (v: number | string | null) => (v === null ? '' : typeof v === 'number' ? String(v) : /[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v);
  return [header.map(cell).join(','), ...rows.map((r) => r.map(cell).join(','))].join('\n') + '\n';
}
