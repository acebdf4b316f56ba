/** Tables as CSV (RFC 4180: comma-separated, quoted when needed, CRLF lines); non-finite numbers are empty. */
export function toCsv(header: readonly string[], rows: readonly (readonly (number | string)[])[]): string {
  const cell = (value: number | string) => {
    const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
    return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
  };
  return [header, ...rows].map((row) => row.map(cell).join(',')).join('\r\n') + '\r\n';
}

/** A column name with its unit in brackets: "N_mean [fish]"; no brackets without a unit. */
export function withUnit(name: string, unit: string | undefined): string {
  return unit ? `${name} [${unit}]` : name;
}

/** Rows of named values as CSV, columns in order of first appearance; null is empty. */
export function recordsCsv(rows: readonly Readonly<Record<string, number | string | null>>[]): string {
  const header = [...new Set(rows.flatMap((row) => Object.keys(row)))];
  return toCsv(
    header,
    rows.map((row) => header.map((key) => row[key] ?? '')),
  );
}
