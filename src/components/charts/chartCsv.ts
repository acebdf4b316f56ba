/** The data behind a chart as CSV (RFC 4180: comma-separated, quoted when needed, CRLF lines). */
export function toCsv(header: readonly string[], rows: readonly (readonly (number | string)[])[]): string {
  const cell = (value: number | string) => {
    const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
    return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
  };
  return [header, ...rows].map((row) => row.map(cell).join(',')).join('\r\n') + '\r\n';
}

/** A file name from a chart title: letters, digits and dashes only. */
export function fileNameFor(title: string): string {
  const slug = title
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60);
  return slug || 'meander-chart';
}
