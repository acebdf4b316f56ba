// The data behind a chart as CSV: the one CSV writer, shared with the results export.
export { toCsv } from '@shared/run/csv';

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
