import type { ExprNode } from '../expr/tree';
import type { ExactForm } from './problem';

/**
 * Which closed-form transition a model has, read from its checked expression trees (never from
 * the text): a linear system with constant coefficients (drift affine in the states, diffusion
 * free of states and time: Ornstein–Uhlenbeck and its multivariate kin) has a Gaussian
 * transition; a one-state model with drift and diffusion proportional to the state (geometric
 * Brownian motion) has a lognormal one. Whether the intercepts really vanish for GBM is checked
 * with numbers when the fit starts (exact-likelihood.ts), since parameters can cancel.
 */

/** 'constant': no state, no time; 'affine': at most linear in the states; 'other': anything else. */
type Degree = 'constant' | 'affine' | 'other';

const rank: Record<Degree, number> = { constant: 0, affine: 1, other: 2 };
const max = (a: Degree, b: Degree): Degree => (rank[a] >= rank[b] ? a : b);

function degreeIn(node: ExprNode, states: ReadonlySet<string>, time: string): Degree {
  const of = (n: ExprNode) => degreeIn(n, states, time);
  switch (node.kind) {
    case 'number':
    case 'constant':
      return 'constant';
    case 'name':
      if (node.name === time) return 'other';
      return states.has(node.name) ? 'affine' : 'constant';
    case 'unary': {
      const operand = of(node.operand);
      return node.op === '!' && operand !== 'constant' ? 'other' : operand;
    }
    case 'arithmetic': {
      const left = of(node.left);
      const right = of(node.right);
      if (node.op === '+' || node.op === '-') return max(left, right);
      if (node.op === '*') {
        if (left === 'constant') return right;
        if (right === 'constant') return left;
        return 'other';
      }
      if (node.op === '/') return right === 'constant' ? left : 'other';
      return left === 'constant' && right === 'constant' ? 'constant' : 'other';
    }
    case 'comparison':
    case 'logical':
      return of(node.left) === 'constant' && of(node.right) === 'constant' ? 'constant' : 'other';
    case 'conditional':
      return [node.test, node.then, node.otherwise].every((n) => of(n) === 'constant') ? 'constant' : 'other';
    case 'call':
      return node.args.every((arg) => of(arg) === 'constant') ? 'constant' : 'other';
  }
}

export interface ModelTrees {
  stateNames: readonly string[];
  drift: readonly ExprNode[];
  /** d × m; null where a state does not feel a noise source. */
  diffusion: readonly (readonly (ExprNode | null)[])[];
}

export interface Recognition {
  form: ExactForm | null;
  /** Why no closed form applies, in words; null when one does. */
  reason: string | null;
}

export function recogniseExactForm(trees: ModelTrees, time = 't'): Recognition {
  const states = new Set(trees.stateNames);
  const driftDegrees = trees.drift.map((node) => degreeIn(node, states, time));
  const diffusionDegrees = trees.diffusion.map((row) =>
    row.map((node) => (node === null ? 'constant' : degreeIn(node, states, time))),
  );
  const driftAffine = driftDegrees.every((d) => d !== 'other');
  const diffusionConstant = diffusionDegrees.every((row) => row.every((d) => d === 'constant'));
  if (driftAffine && diffusionConstant) return { form: 'linear', reason: null };
  const diffusionAffine = diffusionDegrees.every((row) => row.every((d) => d !== 'other'));
  if (trees.stateNames.length === 1 && driftAffine && diffusionAffine) return { form: 'gbm', reason: null };
  const badDrift = trees.stateNames.filter((_, i) => driftDegrees[i] === 'other');
  if (badDrift.length > 0)
    return {
      form: null,
      reason: `the drift of ${badDrift.join(', ')} is not linear in the states with constant coefficients, so no closed-form transition is known`,
    };
  return {
    form: null,
    reason:
      trees.stateNames.length === 1
        ? 'the diffusion is neither constant nor proportional to the state, so no closed-form transition is known'
        : 'the diffusion depends on the states or on time; closed forms are known here only for constant diffusion',
  };
}
