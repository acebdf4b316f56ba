import type { SimulationPlan } from './plan';
import { LOSS_CAUSE_CODES, type LossCause, type LossSummary } from './result';
import { statesMentioned } from './methods/source-tools';

/**
 * Beyond this share of lost paths, every estimate of a run is conditional on the surviving paths
 * and is labelled so. 1 % is a judgement (common practice, no source): below it the survivors'
 * law differs from the model's by at most about that share in any probability.
 */
export const LOSS_SHARE_LIMIT = 0.01;

/** Functions of the expression language that are not defined on the whole real line. */
const PARTIAL_FUNCTIONS: { helper: string; name: string; domain: string }[] = [
  { helper: 'f_sqrt', name: 'square root', domain: 'negative values' },
  { helper: 'f_log', name: 'logarithm', domain: 'zero or negative values' },
  { helper: 'f_log10', name: 'logarithm', domain: 'zero or negative values' },
  { helper: 'f_log1p', name: 'logarithm', domain: 'values at or below −1' },
  { helper: 'f_pow', name: 'power', domain: 'negative bases with a fractional exponent' },
  { helper: 'f_asin', name: 'inverse sine', domain: 'values outside [−1, 1]' },
  { helper: 'f_acos', name: 'inverse cosine', domain: 'values outside [−1, 1]' },
];

/** Arguments of every call of `helper` in a source (the text between its balanced brackets). */
function callArguments(source: string, helper: string): string[] {
  const found: string[] = [];
  const pattern = new RegExp(`(?<![\\w$.])${helper}\\(`, 'g');
  for (const match of source.matchAll(pattern)) {
    const open = match.index + match[0].length;
    let depth = 1;
    let close = open;
    while (close < source.length && depth > 0) {
      if (source[close] === '(') depth++;
      else if (source[close] === ')') depth--;
      close++;
    }
    found.push(source.slice(open, close - 1));
  }
  return found;
}

/** Where a model uses a partial function of a state, with advice fitting each function. */
function domainAdvice(plan: SimulationPlan): string[] {
  const { model } = plan;
  const coefficients = model.drift.flatMap((drift, i) => [
    { place: `the drift of ${model.stateNames[i]}`, source: drift },
    ...model.diffusion[i]!.map((source, j) => ({
      place: `the diffusion of ${model.stateNames[i]}${model.noiseNames.length > 1 ? ` (noise ${model.noiseNames[j]})` : ''}`,
      source,
    })),
  ]);
  const advice: string[] = [];
  for (const { place, source } of coefficients) {
    for (const fn of PARTIAL_FUNCTIONS) {
      const states = [...new Set(callArguments(source, fn.helper).flatMap(statesMentioned))];
      if (states.length === 0) continue;
      const names = states.map((i) => model.stateNames[i]!);
      const first = names[0]!;
      if (fn.helper === 'f_sqrt') {
        advice.push(
          `the square root in ${place} meets negative values once ${names.join(' or ')} crosses zero, which the discrete steps allow even when the exact solution stays at or above zero: give ${first} a boundary rule (reflect or absorb at 0), or write sqrt(max(${first}, 0)) (full truncation; Lord, Koekkoek & van Dijk 2010)`,
        );
      } else {
        advice.push(
          `the ${fn.name} in ${place} is not defined for ${fn.domain} of its argument (${names.join(', ')}): keep ${first} inside that domain with a boundary rule, or rewrite the coefficient so that it is defined everywhere the steps can go`,
        );
      }
    }
  }
  if (advice.length === 0) {
    advice.push(
      'a coefficient was not a number (0/0, ∞ − ∞, or a function outside its domain): check where the drift and diffusion are defined, and keep the states there with boundary rules',
    );
  }
  return advice;
}

function growthAdvice(plan: SimulationPlan, h: number, cause: 'infinite' | 'bound'): string[] {
  const smaller = `try a smaller step: h = ${(h / 4).toPrecision(3)} (${(plan.steps * 4).toLocaleString('en')} steps) instead of ${h.toPrecision(3)}; if paths still grow without bound, the model itself may explode in finite time`;
  return cause === 'infinite'
    ? [
        smaller,
        'a blow-up bound stops exploding paths before they overflow',
        'a division by zero also gives an infinite value: check denominators that can reach 0',
      ]
    : [smaller];
}

function percent(share: number): string {
  return `${(100 * share).toPrecision(share < 0.001 ? 1 : 3)} %`;
}

export function lossSummary(
  plan: SimulationPlan,
  lossTime: Float64Array,
  lossCause: Uint8Array,
  h: number,
): LossSummary {
  const paths = lossTime.length;
  const byCause: Record<LossCause, number> = { domain: 0, infinite: 0, bound: 0 };
  let firstTime = Infinity;
  for (let p = 0; p < paths; p++) {
    const cause = lossCause[p]!;
    if (cause === LOSS_CAUSE_CODES.none) continue;
    if (cause === LOSS_CAUSE_CODES.domain) byCause.domain++;
    else if (cause === LOSS_CAUSE_CODES.infinite) byCause.infinite++;
    else byCause.bound++;
    if (lossTime[p]! < firstTime) firstTime = lossTime[p]!;
  }
  const count = byCause.domain + byCause.infinite + byCause.bound;
  const share = paths > 0 ? count / paths : 0;
  const allLost = paths > 0 && count === paths;
  const conditional = share > LOSS_SHARE_LIMIT;
  if (count === 0)
    return { count, paths, share, byCause, firstTime: null, conditional, allLost, message: null, advice: [] };

  const causes = [
    byCause.domain > 0
      ? `${byCause.domain.toLocaleString('en')} became not a number (a coefficient evaluated outside its domain)`
      : '',
    byCause.infinite > 0 ? `${byCause.infinite.toLocaleString('en')} became infinite` : '',
    byCause.bound > 0
      ? `${byCause.bound.toLocaleString('en')} left the blow-up bound ±${plan.blowupBound ?? Infinity}`
      : '',
  ].filter((text) => text !== '');
  const survivors = paths - count;
  const consequence = allLost
    ? 'Every path was lost: this run has no estimates.'
    : conditional
      ? `Every estimate of this run is conditional on the ${survivors.toLocaleString('en')} surviving paths and can be far from the model's own.`
      : 'They are left out of the statistics.';
  const message = `${count.toLocaleString('en')} of ${paths.toLocaleString('en')} paths (${percent(share)}) were lost, the first at t = ${firstTime.toPrecision(4)}: ${causes.join('; ')}. ${consequence}`;
  const advice = [
    ...(byCause.domain > 0 ? domainAdvice(plan) : []),
    ...(byCause.infinite > 0 ? growthAdvice(plan, h, 'infinite') : []),
    ...(byCause.bound > 0 && byCause.infinite === 0 ? growthAdvice(plan, h, 'bound') : []),
  ];
  return { count, paths, share, byCause, firstTime, conditional, allLost, message, advice };
}
