import { z } from 'zod';
import type { CellKindDefinition } from './kind';
import { cellIdSchema } from './fields';

/** A note: markdown text that explains the sheet. It reads nothing and computes nothing. */
export const noteCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('note'),
  text: z.string().max(100_000, 'a note is at most 100,000 characters'),
});

export const noteKind: CellKindDefinition<'note'> = {
  kind: 'note',
  label: 'Note',
  word: 'note',
  colour: 'sand',
  inert: true,
  create: ({ id }) => ({ id, kind: 'note', text: 'Write what this part of the sheet is for.' }),
  title(cell) {
    const firstLine = cell.text.split('\n').find((line) => line.trim() !== '') ?? '';
    const text = firstLine.replace(/^#+\s*/, '').trim();
    return text.length > 60 ? `${text.slice(0, 57)}…` : text;
  },
  reads: () => [],
};
