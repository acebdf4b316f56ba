/** A problem in a sheet, located in one cell: `path` leads to the field, from/to into its expression. */
export interface SheetIssue {
  cellId: string;
  path: (string | number)[];
  message: string;
  from?: number;
  to?: number;
}

/** Thrown by the plan builder and the parameter resolver when the sheet has problems; carries them all. */
export class SheetIssuesError extends Error {
  readonly issues: readonly SheetIssue[];

  constructor(issues: readonly SheetIssue[], what = 'the sheet') {
    super(
      `${what}: ${issues.length === 1 ? '1 problem' : `${issues.length} problems`}: ${issues.map(describeIssue).join('; ')}`,
    );
    this.name = 'SheetIssuesError';
    this.issues = issues;
  }
}

/** One line for an issue: `cell m1, states[0].drift: unknown name 'k'; …`. */
export function describeIssue(issue: SheetIssue): string {
  const path = issue.path
    .map((part, i) => (typeof part === 'number' ? `[${part}]` : i === 0 ? part : `.${part}`))
    .join('');
  return `cell ${issue.cellId}${path ? `, ${path}` : ''}: ${issue.message}`;
}

/** An issue as a cell's editor shows it: the cell is known, the path leads inside it. */
export type CellIssue = Omit<SheetIssue, 'cellId'>;
