import { exampleSheets } from '@shared/examples/index';
import type { SheetDocument } from '@shared/sheet/document';

/**
 * The documents a fresh site starts with: the shared example sheets. To seed something else,
 * change this one function.
 */
export function demoSheetDocuments(): SheetDocument[] {
  return exampleSheets.map((example) => structuredClone(example.document));
}
