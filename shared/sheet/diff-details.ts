import { changeText, sameValue, symbol, valueText } from './diff-format';

/**
 * What changed inside one cell, in words a modeller reads ("σ: 0.20 → 0.35", "drift of N:
 * `a` → `b`", "paths: 10,000 → 50,000"). Works on the document's plain data, field by field:
 * parameters, state variables and noise sources are matched by name (a name that changes at the
 * same place is a rename), other fields are compared with a label. A field no label knows still
 * shows, under its own name.
 */

type Plain = Record<string, unknown>;

const FIELD_LABELS: Record<string, string> = {
  name: 'name',
  text: 'text',
  model: 'model',
  simulation: 'simulation',
  method: 'method',
  t0: 'start time',
  t1: 'end time',
  steps: 'steps',
  stepSize: 'step size',
  paths: 'paths',
  seed: 'seed',
  saveCount: 'saved times',
  samplePaths: 'sample paths kept',
  blowupBound: 'blow-up bound',
  calculus: 'calculus',
  view: 'view',
  state: 'state',
  stateY: 'second state',
  pathCount: 'paths drawn',
  time: 'time',
  bins: 'bins',
  title: 'title',
  quantity: 'quantity',
  level: 'level',
  probability: 'probability',
  direction: 'direction',
  levels: 'step sizes',
  coarsestSteps: 'steps at the coarsest level',
  reference: 'reference',
};

const VALUE_LABELS: Record<string, string> = {
  'euler-maruyama': 'Euler–Maruyama',
  milstein: 'Milstein',
  heun: 'stochastic Heun',
  ito: 'Itô',
  stratonovich: 'Stratonovich',
};

/** Fields compared by their own rules, not as plain values. */
const STRUCTURED = new Set([
  'id',
  'kind',
  'params',
  'states',
  'noises',
  'correlation',
  'boundaries',
  'overrides',
]);

const named = (value: unknown): string | undefined =>
  typeof value === 'string' ? VALUE_LABELS[value] : undefined;

function plainFields(before: Plain, after: Plain): string[] {
  const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])].filter(
    (key) => !STRUCTURED.has(key),
  );
  return keys.flatMap((key) => {
    if (sameValue(before[key], after[key])) return [];
    if (key === 'text') return ['text edited'];
    const fieldLabel = FIELD_LABELS[key] ?? key;
    const [wasNamed, nowNamed] = [named(before[key]), named(after[key])];
    if (wasNamed && nowNamed) return [`${fieldLabel}: ${wasNamed} → ${nowNamed}`];
    return [changeText(fieldLabel, before[key], after[key])];
  });
}

/**
 * Pairs list items by name; an item whose name is gone, with a new name at the same position,
 * is a rename.
 */
function pairByName(before: Plain[], after: Plain[]) {
  const name = (item: Plain) => String(item.name);
  const afterNames = new Set(after.map(name));
  const beforeNames = new Set(before.map(name));
  const pairs: { before: Plain | null; after: Plain | null }[] = [];
  const used = new Set<Plain>();
  before.forEach((item, index) => {
    const same = after.find((candidate) => name(candidate) === name(item));
    const atSamePlace = after[index];
    if (same) {
      pairs.push({ before: item, after: same });
      used.add(same);
    } else if (atSamePlace && !beforeNames.has(name(atSamePlace)) && !afterNames.has(name(item))) {
      pairs.push({ before: item, after: atSamePlace });
      used.add(atSamePlace);
    } else {
      pairs.push({ before: item, after: null });
    }
  });
  for (const item of after) if (!used.has(item)) pairs.push({ before: null, after: item });
  return pairs;
}

function listOf(value: unknown): Plain[] {
  return Array.isArray(value) ? (value as Plain[]) : [];
}

function recordOf(value: unknown): Plain {
  return value && typeof value === 'object' ? (value as Plain) : {};
}

function paramDetails(before: Plain, after: Plain): string[] {
  return pairByName(listOf(before.params), listOf(after.params)).flatMap(({ before: was, after: now }) => {
    if (!was) return [`new parameter ${symbol(String(now!.name))} = ${valueText(now!.value, true)}`];
    if (!now) return [`parameter ${symbol(String(was.name))} removed`];
    const lines: string[] = [];
    const wasName = symbol(String(was.name));
    const nowName = symbol(String(now.name));
    if (wasName !== nowName) lines.push(`parameter renamed: ${wasName} → ${nowName}`);
    if (!sameValue(was.value, now.value)) {
      const expression = typeof was.value === 'string' || typeof now.value === 'string';
      lines.push(changeText(nowName, was.value, now.value, expression));
    }
    for (const field of ['unit', 'min', 'max', 'description'] as const) {
      if (!sameValue(was[field], now[field]))
        lines.push(changeText(`${field} of ${nowName}`, was[field], now[field]));
    }
    return lines;
  });
}

function stateDetails(before: Plain, after: Plain): string[] {
  return pairByName(listOf(before.states), listOf(after.states)).flatMap(({ before: was, after: now }) => {
    if (!was) return [`new state variable ${symbol(String(now!.name))}, drift \`${String(now!.drift)}\``];
    if (!now) return [`state variable ${symbol(String(was.name))} removed`];
    const state = symbol(String(now.name));
    const lines: string[] = [];
    if (was.name !== now.name) lines.push(`state variable renamed: ${symbol(String(was.name))} → ${state}`);
    for (const [field, what] of [
      ['initial', 'initial value'],
      ['drift', 'drift'],
      ['exact', 'exact solution'],
    ] as const) {
      if (!sameValue(was[field], now[field]))
        lines.push(changeText(`${what} of ${state}`, was[field], now[field], true));
    }
    if (!sameValue(was.unit, now.unit)) lines.push(changeText(`unit of ${state}`, was.unit, now.unit));
    const wasDiffusion = recordOf(was.diffusion);
    const nowDiffusion = recordOf(now.diffusion);
    for (const noise of new Set([...Object.keys(wasDiffusion), ...Object.keys(nowDiffusion)])) {
      if (!sameValue(wasDiffusion[noise], nowDiffusion[noise])) {
        lines.push(
          changeText(`diffusion of ${state} on ${noise}`, wasDiffusion[noise], nowDiffusion[noise], true),
        );
      }
    }
    return lines;
  });
}

function noiseDetails(before: Plain, after: Plain): string[] {
  const lines = pairByName(listOf(before.noises), listOf(after.noises)).flatMap(
    ({ before: was, after: now }) => {
      if (!was) return [`new noise source ${String(now!.name)}`];
      if (!now) return [`noise source ${String(was.name)} removed`];
      if (was.name !== now.name) return [`noise source renamed: ${String(was.name)} → ${String(now.name)}`];
      return sameValue(was.description, now.description)
        ? []
        : [changeText(`description of ${String(now.name)}`, was.description, now.description)];
    },
  );
  if (!sameValue(before.correlation, after.correlation)) lines.push('noise correlation changed');
  return lines;
}

function keyedDetails(before: Plain, after: Plain, field: 'boundaries' | 'overrides'): string[] {
  const was = recordOf(before[field]);
  const now = recordOf(after[field]);
  return [...new Set([...Object.keys(was), ...Object.keys(now)])].flatMap((key) => {
    if (sameValue(was[key], now[key])) return [];
    if (field === 'overrides') return [changeText(`override of ${symbol(key)}`, was[key], now[key])];
    return [`boundary of ${symbol(key)}: ${boundaryText(was[key])} → ${boundaryText(now[key])}`];
  });
}

function boundaryText(rule: unknown): string {
  const { rule: kind, level, side } = recordOf(rule);
  if (!kind || kind === 'none') return 'none';
  return `${String(kind)} ${String(side ?? 'below')} ${valueText(level)}`;
}

/** The changes inside a cell kept from one version to the next (empty when it is the same). */
export function cellDetails(before: Plain, after: Plain): string[] {
  if (before.kind !== after.kind) return [`kind: ${String(before.kind)} → ${String(after.kind)}`];
  return [
    ...plainFields(before, after),
    ...paramDetails(before, after),
    ...stateDetails(before, after),
    ...noiseDetails(before, after),
    ...keyedDetails(before, after, 'boundaries'),
    ...keyedDetails(before, after, 'overrides'),
  ];
}
