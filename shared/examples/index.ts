import type { SheetDocument } from '../sheet/document';
import { parseSheetDocument } from '../sheet/upgrade';
import harvestedFishStock from './harvested-fish-stock.json';
import soilMoistureAnomaly from './soil-moisture-anomaly.json';
import grazingTwoSpecies from './grazing-two-species.json';
import commodityPriceIndex from './commodity-price-index.json';

/**
 * Demo sheets of our own invention, for the seeder (first sheets of a new site) and the UI's
 * "start from an example" list. The JSON files are the source; they are parsed once here, so a
 * broken example fails loudly at import rather than showing up half-valid on a page.
 */
export interface ExampleSheet {
  /** Stable key, also the JSON file's base name. */
  slug: string;
  document: SheetDocument;
}

const sources: Record<string, unknown> = {
  'harvested-fish-stock': harvestedFishStock,
  'soil-moisture-anomaly': soilMoistureAnomaly,
  'grazing-two-species': grazingTwoSpecies,
  'commodity-price-index': commodityPriceIndex,
};

function exampleDocument(slug: string, json: unknown): SheetDocument {
  const parsed = parseSheetDocument(json);
  if (!parsed.success) throw new Error(`example sheet ${slug} is not valid: ${parsed.error.message}`);
  return parsed.data;
}

export const exampleSheets: readonly ExampleSheet[] = Object.entries(sources).map(([slug, json]) => ({
  slug,
  document: exampleDocument(slug, json),
}));

export function findExampleSheet(slug: string): ExampleSheet | undefined {
  return exampleSheets.find((example) => example.slug === slug);
}
