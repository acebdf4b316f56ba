import type { SheetDocument } from '../sheet/document';
import { kindOf } from '../cells/registry';
import type { CellOutput } from './outputs';
import { recordsCsv, toCsv, withUnit } from './csv';
import { scenariosTable } from './scenarios-result';
import { sweepTable } from './sweep-result';

/**
 * A sheet's results as CSV files: per simulation its saved statistics (wide: one row per saved
 * time) and its sample paths (long: one row per path and time); all probes in one file, all
 * step-size studies in one file; per sweep and per scenarios cell its table. Columns carry units
 * in brackets. Cells without a current output are left out; other kinds of output (a fit, later)
 * are listed generically by the caller.
 */

export interface ResultFile {
  fileName: string;
  csv: string;
}

type Outputs = (cellId: string) => CellOutput | undefined;

function stateUnits(doc: SheetDocument, modelId: string): Map<string, string> {
  const model = doc.cells.find((cell) => cell.id === modelId);
  return new Map(model?.kind === 'model' ? model.states.map((s) => [s.name, s.unit ?? '']) : []);
}

const squared = (unit: string) => (unit ? `(${unit})²` : '');

/**
 * The names of the files `resultFiles` would write, without building them (a sheet page lists
 * them in a menu and builds one only when it is asked for).
 */
export function resultFileNames(doc: SheetDocument, outputs: Outputs): string[] {
  const names: string[] = [];
  let probes = false;
  let studies = false;
  for (const cell of doc.cells) {
    const output = outputs(cell.id);
    if (cell.kind === 'simulation' && output?.kind === 'simulation')
      names.push(`${cell.id}-statistics.csv`, `${cell.id}-sample-paths.csv`);
    probes ||= cell.kind === 'probe' && output?.kind === 'probe';
    studies ||= cell.kind === 'study' && output?.kind === 'study';
  }
  if (probes) names.push('probes.csv');
  if (studies) names.push('studies.csv');
  return names;
}

export function resultFiles(doc: SheetDocument, outputs: Outputs): ResultFile[] {
  const files: ResultFile[] = [];
  const probeRows: (number | string)[][] = [];
  const studyRows: (number | string)[][] = [];
  for (const cell of doc.cells) {
    const output = outputs(cell.id);
    if (cell.kind === 'simulation' && output?.kind === 'simulation') {
      const units = stateUnits(doc, cell.model);
      files.push(statisticsFile(cell.id, output, units), pathsFile(cell.id, output, units));
    }
    if (cell.kind === 'probe' && output?.kind === 'probe') {
      const { estimate } = output;
      probeRows.push([
        cell.id,
        kindOf(cell).title(cell),
        probeUnit(doc, cell),
        estimate.estimate,
        estimate.standardError,
        estimate.ci[0],
        estimate.ci[1],
        estimate.paths,
        (estimate.warnings ?? []).join(' '),
      ]);
    }
    if (cell.kind === 'sweep' && output?.kind === 'sweep')
      files.push({ fileName: `sweep-${cell.id}.csv`, csv: recordsCsv(sweepTable(output.result)) });
    if (cell.kind === 'scenarios' && output?.kind === 'scenarios')
      files.push({ fileName: `scenarios-${cell.id}.csv`, csv: recordsCsv(scenariosTable(output.result)) });
    if (cell.kind === 'study' && output?.kind === 'study') {
      const { result } = output;
      for (const level of result.levels)
        studyRows.push([
          cell.id,
          result.reference,
          level.steps,
          level.h,
          level.strongError,
          level.strongSE,
          level.weakError,
          level.weakSE,
          result.strongOrder,
          result.weakOrder,
        ]);
    }
  }
  if (probeRows.length > 0)
    files.push({
      fileName: 'probes.csv',
      csv: toCsv(
        ['cell', 'probe', 'unit', 'estimate', 'standard_error', 'ci95_low', 'ci95_high', 'paths', 'warnings'],
        probeRows,
      ),
    });
  if (studyRows.length > 0)
    files.push({
      fileName: 'studies.csv',
      csv: toCsv(
        [
          'cell',
          'reference',
          'steps',
          'h [time]',
          'strong_error',
          'strong_error_se',
          'weak_error',
          'weak_error_se',
          'fitted_strong_order',
          'fitted_weak_order',
        ],
        studyRows,
      ),
    });
  return files;
}

function statisticsFile(
  cellId: string,
  output: Extract<CellOutput, { kind: 'simulation' }>,
  units: Map<string, string>,
): ResultFile {
  const { result } = output;
  const header = ['t [time]'];
  for (const state of result.stateNames) {
    const unit = units.get(state) ?? '';
    header.push(withUnit(`${state}_mean`, unit), withUnit(`${state}_variance`, squared(unit)));
    for (const q of ['q05', 'q25', 'q50', 'q75', 'q95', 'min', 'max'])
      header.push(withUnit(`${state}_${q}`, unit));
    header.push(`${state}_live_paths`);
  }
  const rows = Array.from(result.savedTimes, (t, k) => {
    const row: number[] = [t];
    for (const stats of result.stats)
      row.push(
        stats.mean[k]!,
        stats.variance[k]!,
        stats.q05[k]!,
        stats.q25[k]!,
        stats.q50[k]!,
        stats.q75[k]!,
        stats.q95[k]!,
        stats.min[k]!,
        stats.max[k]!,
        stats.live[k]!,
      );
    return row;
  });
  return { fileName: `${cellId}-statistics.csv`, csv: toCsv(header, rows) };
}

function pathsFile(
  cellId: string,
  output: Extract<CellOutput, { kind: 'simulation' }>,
  units: Map<string, string>,
): ResultFile {
  const { result } = output;
  const rows: (number | string)[][] = [];
  result.stateNames.forEach((state, i) => {
    const unit = units.get(state) ?? '';
    (result.samplePaths[i] ?? []).forEach((path, p) => {
      path.forEach((value, k) => rows.push([state, unit, p + 1, result.savedTimes[k]!, value]));
    });
  });
  return {
    fileName: `${cellId}-sample-paths.csv`,
    csv: toCsv(['state', 'unit', 'path', 't [time]', 'value'], rows),
  };
}

function probeUnit(
  doc: SheetDocument,
  cell: Extract<SheetDocument['cells'][number], { kind: 'probe' }>,
): string {
  const simulation = doc.cells.find((c) => c.id === cell.simulation);
  const unit =
    simulation?.kind === 'simulation' ? (stateUnits(doc, simulation.model).get(cell.state) ?? '') : '';
  switch (cell.quantity) {
    case 'mean':
    case 'quantile':
      return unit;
    case 'variance':
    case 'covariance':
      return squared(unit);
    case 'first-passage':
      return 'time';
    case 'correlation':
      return '';
    default:
      return 'probability';
  }
}
