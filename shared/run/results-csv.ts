import type { SheetDocument } from '../sheet/document';
import { kindOf } from '../cells/registry';
import type { CellOutput } from './outputs';
import { recordsCsv, toCsv, withUnit } from './csv';
import type { FitResult } from '../fit/problem';
import { scenariosTable } from './scenarios-result';
import { sweepTable } from './sweep-result';

/**
 * A sheet's results as CSV files: per simulation its saved statistics (wide: one row per saved
 * time) and its sample paths (long: one row per path and time); all probes in one file, all
 * step-size studies in one file, all fits in one file (one row per estimated parameter); per
 * sweep and per scenarios cell its table. Columns carry units in brackets. Cells without a
 * current output are left out.
 */

/** A file of results; its text is built the first time `csv` is read. */
export interface ResultFile {
  readonly fileName: string;
  readonly csv: string;
}

function lazyFile(fileName: string, build: () => string): ResultFile {
  let text: string | undefined;
  return {
    fileName,
    get csv() {
      return (text ??= build());
    },
  };
}

type Outputs = (cellId: string) => CellOutput | undefined;

function stateUnits(doc: SheetDocument, modelId: string): Map<string, string> {
  const model = doc.cells.find((cell) => cell.id === modelId);
  return new Map(model?.kind === 'model' ? model.states.map((s) => [s.name, s.unit ?? '']) : []);
}

const squared = (unit: string) => (unit ? `(${unit})²` : '');

/**
 * The names of the files `resultFiles` would write, without building their text (a sheet page
 * lists them in a menu and builds one only when it is asked for).
 */
export function resultFileNames(doc: SheetDocument, outputs: Outputs): string[] {
  return resultFiles(doc, outputs).map((file) => file.fileName);
}

export function resultFiles(doc: SheetDocument, outputs: Outputs): ResultFile[] {
  const files: ResultFile[] = [];
  const probeRows: (number | string)[][] = [];
  const studyRows: (number | string)[][] = [];
  const fitRows: (number | string)[][] = [];
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
      files.push(lazyFile(`sweep-${cell.id}.csv`, () => recordsCsv(sweepTable(output.result))));
    if (cell.kind === 'scenarios' && output?.kind === 'scenarios')
      files.push(lazyFile(`scenarios-${cell.id}.csv`, () => recordsCsv(scenariosTable(output.result))));
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
    if (cell.kind === 'fit' && output?.kind === 'fit') fitRows.push(...fitFileRows(cell.id, output.result));
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
  if (fitRows.length > 0)
    files.push({
      fileName: 'fits.csv',
      csv: toCsv(
        [
          'cell',
          'method',
          'parameter',
          'unit',
          'estimate',
          'standard_error',
          'ci95_low',
          'ci95_high',
          'at_bound',
          'log_likelihood',
          'aic',
          'observations',
          'series',
          'converged',
          'convergence',
          'ks_p_value',
          'warnings',
        ],
        fitRows,
      ),
    });
  return files;
}

/** One row per estimated parameter; a blank where a number is not available. */
function fitFileRows(cellId: string, result: FitResult): (number | string)[][] {
  const orBlank = (x: number | null) => (x === null ? '' : x);
  return result.estimates.map((e) => [
    cellId,
    result.method,
    e.name,
    e.unit,
    e.estimate,
    orBlank(e.standardError),
    orBlank(e.ci[0]),
    orBlank(e.ci[1]),
    e.atBound ? 'yes' : 'no',
    result.logLikelihood,
    result.aic,
    result.observations,
    result.groups,
    result.converged ? 'yes' : 'no',
    result.convergence,
    orBlank(result.residuals.ksPValue),
    result.warnings.join(' '),
  ]);
}

function statisticsFile(
  cellId: string,
  output: Extract<CellOutput, { kind: 'simulation' }>,
  units: Map<string, string>,
): ResultFile {
  return lazyFile(`${cellId}-statistics.csv`, () => statisticsCsv(output, units));
}

function statisticsCsv(
  output: Extract<CellOutput, { kind: 'simulation' }>,
  units: Map<string, string>,
): string {
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
  return toCsv(header, rows);
}

function pathsFile(
  cellId: string,
  output: Extract<CellOutput, { kind: 'simulation' }>,
  units: Map<string, string>,
): ResultFile {
  return lazyFile(`${cellId}-sample-paths.csv`, () => pathsCsv(output, units));
}

function pathsCsv(output: Extract<CellOutput, { kind: 'simulation' }>, units: Map<string, string>): string {
  const { result } = output;
  const rows: (number | string)[][] = [];
  result.stateNames.forEach((state, i) => {
    const unit = units.get(state) ?? '';
    (result.samplePaths[i] ?? []).forEach((path, p) => {
      path.forEach((value, k) => rows.push([state, unit, p + 1, result.savedTimes[k]!, value]));
    });
  });
  return toCsv(['state', 'unit', 'path', 't [time]', 'value'], rows);
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
