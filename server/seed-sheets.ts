import { exampleSheets } from '@shared/examples/index';
import pondOxygen from '@shared/examples/sheet-files/pond-oxygen.meander.json';
import type { SheetDocument } from '@shared/sheet/document';

/**
 * The documents a fresh site starts with: the shared example sheets. To seed something else,
 * change this one function.
 */
export function demoSheetDocuments(): SheetDocument[] {
  return exampleSheets.map((example) => structuredClone(example.document));
}

/**
 * Demo sheets with observed data, as sheet files (scripts/pond-oxygen-data.ts writes the one
 * there is); the seeder imports each for the first demo member.
 */
export function demoSheetFiles(): Uint8Array[] {
  return [new TextEncoder().encode(JSON.stringify(pondOxygen))];
}
