import type { ProbeCell, ProbeQuantity } from '@shared/sheet/document';
import { formatSignificant } from './numberFormat';

export interface QuantityInfo {
  value: ProbeQuantity;
  label: string;
  usesTime: boolean;
  usesLevel: 'required' | 'optional' | 'no';
  usesProbability: boolean;
  usesDirection: boolean;
  /** Covariance and correlation read a second state. */
  usesStateY?: boolean;
  /** Crossings between steps: discrete monitoring or the continuity correction. */
  usesMonitoring?: boolean;
}

export const PROBE_QUANTITIES: readonly QuantityInfo[] = [
  {
    value: 'mean',
    label: 'Mean',
    usesTime: true,
    usesLevel: 'no',
    usesProbability: false,
    usesDirection: false,
  },
  {
    value: 'variance',
    label: 'Variance',
    usesTime: true,
    usesLevel: 'no',
    usesProbability: false,
    usesDirection: false,
  },
  {
    value: 'quantile',
    label: 'Quantile',
    usesTime: true,
    usesLevel: 'no',
    usesProbability: true,
    usesDirection: false,
  },
  {
    value: 'exceedance',
    label: 'P(X ≥ a)',
    usesTime: true,
    usesLevel: 'required',
    usesProbability: false,
    usesDirection: false,
  },
  {
    value: 'subceedance',
    label: 'P(X ≤ a)',
    usesTime: true,
    usesLevel: 'required',
    usesProbability: false,
    usesDirection: false,
  },
  {
    value: 'hit-before',
    label: 'P(reach a before the end)',
    usesTime: false,
    usesLevel: 'required',
    usesProbability: false,
    usesDirection: true,
    usesMonitoring: true,
  },
  {
    value: 'first-passage',
    label: 'First-passage time to a',
    usesTime: false,
    usesLevel: 'required',
    usesProbability: false,
    usesDirection: true,
    usesMonitoring: true,
  },
  {
    value: 'extinction',
    label: 'Extinction probability',
    usesTime: false,
    usesLevel: 'optional',
    usesProbability: false,
    usesDirection: false,
  },
  {
    value: 'covariance',
    label: 'Covariance of two states',
    usesTime: true,
    usesLevel: 'no',
    usesProbability: false,
    usesDirection: false,
    usesStateY: true,
  },
  {
    value: 'correlation',
    label: 'Correlation of two states',
    usesTime: true,
    usesLevel: 'no',
    usesProbability: false,
    usesDirection: false,
    usesStateY: true,
  },
];

export function quantityInfo(quantity: ProbeQuantity): QuantityInfo {
  return PROBE_QUANTITIES.find((q) => q.value === quantity) ?? PROBE_QUANTITIES[0]!;
}

/**
 * The cell with another quantity: fields the new quantity needs get a starting value, fields it
 * does not use are dropped so the stored cell says only what the probe means.
 */
export function withQuantity(cell: ProbeCell, quantity: ProbeQuantity, otherState?: string): ProbeCell {
  const info = quantityInfo(quantity);
  const next: ProbeCell = {
    id: cell.id,
    kind: 'probe',
    simulation: cell.simulation,
    quantity,
    state: cell.state,
  };
  if (info.usesTime && cell.time !== undefined) next.time = cell.time;
  if (info.usesLevel === 'required') next.level = cell.level ?? 0;
  if (info.usesLevel === 'optional' && cell.level !== undefined) next.level = cell.level;
  if (info.usesProbability) next.probability = cell.probability ?? 0.5;
  if (info.usesDirection) next.direction = cell.direction ?? 'above';
  if (info.usesMonitoring && cell.monitoring !== undefined) next.monitoring = cell.monitoring;
  const stateY = cell.stateY ?? otherState;
  if (info.usesStateY && stateY !== undefined) next.stateY = stateY;
  return next;
}

/** A sentence saying what the probe reads, e.g. "P(N ≥ 40) at t = 10". */
export function describeProbe(cell: ProbeCell, endTime: number | null): string {
  const x = cell.state || 'X';
  const at = cell.time ?? endTime;
  const atText = at === null ? 'at the end time' : `at t = ${formatSignificant(at)}`;
  const a = cell.level === undefined ? 'a' : formatSignificant(cell.level);
  const crossing = (cell.direction ?? 'above') === 'above' ? `rises to ${a}` : `falls to ${a}`;
  switch (cell.quantity) {
    case 'mean':
      return `Mean of ${x} ${atText}`;
    case 'variance':
      return `Variance of ${x} ${atText}`;
    case 'quantile':
      return `${formatSignificant((cell.probability ?? 0.5) * 100, 4)} % quantile of ${x} ${atText}`;
    case 'exceedance':
      return `P(${x} ≥ ${a}) ${atText}`;
    case 'subceedance':
      return `P(${x} ≤ ${a}) ${atText}`;
    case 'hit-before':
      return `Probability that ${x} ${crossing} before the end time`;
    case 'first-passage':
      return `Mean time until ${x} first ${crossing}, among paths that do`;
    case 'covariance':
      return `Covariance of ${x} and ${cell.stateY ?? 'Y'} ${atText}`;
    case 'correlation':
      return `Correlation of ${x} and ${cell.stateY ?? 'Y'} ${atText}`;
    case 'extinction':
      return cell.level === undefined
        ? `Probability that ${x} is absorbed at its lower boundary by the end time`
        : `Probability that ${x} is absorbed or at most ${a} by the end time`;
  }
}

export const PROBE_CAUTION =
  'Monte Carlo estimate: sampling error shown as ± and a 95 % interval; results depend on the model, its parameters and the step size. ' +
  'Where results feed financial, medical, environmental or safety decisions, they need independent validation and qualified review.';
