import { describe, expect, it } from 'vitest';
import { probeKind, probeRequest } from '@shared/cells/probe';
import type { ProbeCell } from '@shared/sheet/document';

const pair: ProbeCell = {
  id: 'together',
  kind: 'probe',
  simulation: 'run',
  quantity: 'correlation',
  state: 'prey',
  stateY: 'grazer',
};

describe('covariance and correlation probes', () => {
  it('map the second state to its index for the engine', () => {
    expect(probeRequest(pair, ['grazer', 'prey'])).toEqual({ quantity: 'correlation', state: 1, stateY: 0 });
  });

  it('name both states in their title', () => {
    expect(probeKind.title(pair)).toBe('correlation of prey and grazer');
  });
});
