import { describe, expect, it } from 'vitest';
import { checkSheet, type SheetIssue } from '@shared/sheet';
import { exampleSheets } from '@shared/examples';
import { modelCell, ouSheet, ouWith, simulationCell } from './fixtures';

function messages(issues: SheetIssue[]): string[] {
  return issues.map((i) => i.message);
}

describe('checkSheet', () => {
  it('finds nothing wrong with a sound OU sheet', () => {
    expect(checkSheet(ouSheet())).toEqual([]);
  });

  it('finds nothing wrong with the example sheets', () => {
    for (const example of exampleSheets) expect(checkSheet(example.document), example.slug).toEqual([]);
  });

  describe('names', () => {
    it('rejects duplicate cell ids', () => {
      const doc = ouSheet();
      doc.cells.push({ id: 'intro', kind: 'note', text: 'again' });
      expect(checkSheet(doc)).toEqual([
        { cellId: 'intro', path: ['id'], message: "cell id 'intro' is used by more than one cell" },
      ]);
    });

    it('rejects a parameter defined in two params cells', () => {
      const issues = checkSheet(ouWith({ id: 'p2', kind: 'params', params: [{ name: 'mu', value: 1 }] }));
      expect(issues).toContainEqual({
        cellId: 'p2',
        path: ['params', 0, 'name'],
        message: "parameter 'mu' is already defined in cell 'p'",
      });
    });

    it('rejects a state with the name of a parameter, naming both cells', () => {
      const issues = checkSheet(
        ouWith(
          modelCell({ states: [{ name: 'mu', initial: '1', drift: '-mu', diffusion: { W: 'sigma' } }] }),
        ),
      );
      expect(issues).toContainEqual({
        cellId: 'm',
        path: ['states', 0, 'name'],
        message: "state 'mu' in cell 'm' has the same name as parameter 'mu' in cell 'p'; rename one of them",
      });
    });

    it('rejects a noise source with the name of a state of the same model', () => {
      const issues = checkSheet(
        ouWith(
          modelCell({
            noises: [{ name: 'x' }],
            states: [{ name: 'x', initial: '1', drift: '0', diffusion: { x: '1' } }],
          }),
        ),
      );
      expect(issues).toContainEqual({
        cellId: 'm',
        path: ['noises', 0, 'name'],
        message: "noise source 'x' has the same name as state 'x' in this model",
      });
    });

    it.each([
      ['t', "'t' is reserved for the time; choose another name"],
      ['pi', "'pi' is a built-in constant; choose another name"],
      ['exp', "'exp' is the name of a built-in function; choose another name"],
      ['class', "'class' is a reserved word; choose another name"],
      ['__proto__', "'__proto__' is a reserved word; choose another name"],
    ])('rejects the reserved name %s', (name, message) => {
      const issues = checkSheet(ouWith({ id: 'p2', kind: 'params', params: [{ name, value: 1 }] }));
      expect(issues).toContainEqual({ cellId: 'p2', path: ['params', 0, 'name'], message });
    });

    it('accepts names like s0 and w1, which generation renames', () => {
      expect(
        checkSheet(
          ouWith({
            id: 'p2',
            kind: 'params',
            params: [
              { name: 's0', value: 1 },
              { name: 'w1', value: 2 },
            ],
          }),
        ),
      ).toEqual([]);
    });
  });

  describe('expression scopes', () => {
    it('does not let a parameter read a state or t', () => {
      const issues = checkSheet(
        ouWith({ id: 'p2', kind: 'params', params: [{ name: 'q', value: 'x + t' }] }),
      );
      expect(issues).toEqual([
        expect.objectContaining({
          cellId: 'p2',
          path: ['params', 0, 'value'],
          from: 0,
          to: 1,
          message: expect.stringMatching(/^unknown name 'x'/),
        }),
        expect.objectContaining({
          cellId: 'p2',
          path: ['params', 0, 'value'],
          from: 4,
          to: 5,
          message: expect.stringMatching(/^unknown name 't'/),
        }),
      ]);
    });

    it('lets an initial value read parameters only', () => {
      const issues = checkSheet(
        ouWith(
          modelCell({ states: [{ name: 'x', initial: 'mu + t', drift: '0', diffusion: { W: 'sigma' } }] }),
        ),
      );
      expect(issues).toEqual([
        expect.objectContaining({ cellId: 'm', path: ['states', 0, 'initial'], from: 5, to: 6 }),
      ]);
    });

    it('lets drift and diffusion read parameters, states and t, but not noise names', () => {
      const ok = checkSheet(
        ouWith(
          modelCell({
            states: [
              { name: 'x', initial: '1', drift: 'theta * (mu - x) * t', diffusion: { W: 'sigma * x' } },
            ],
          }),
        ),
      );
      expect(ok).toEqual([]);
      const issues = checkSheet(
        ouWith(modelCell({ states: [{ name: 'x', initial: '1', drift: 'W', diffusion: { W: 'W' } }] })),
      );
      expect(issues.map((i) => i.path)).toEqual([
        ['states', 0, 'drift'],
        ['states', 0, 'diffusion', 'W'],
      ]);
      expect(issues[0]?.message).toBe("unknown name 'W'; names in scope: mu, sigma, t, theta, x, x0");
    });

    it('lets an exact solution read parameters, t, noise and state names', () => {
      const ok = modelCell({
        states: [
          { name: 'x', initial: '1', drift: '0', diffusion: { W: 'sigma' }, exact: 'x + sigma * W + 0 * t' },
        ],
      });
      expect(checkSheet(ouWith(ok))).toEqual([]);
      const issues = checkSheet(
        ouWith(
          modelCell({
            states: [{ name: 'x', initial: '1', drift: '0', diffusion: { W: '1' }, exact: 'x + W + y' }],
          }),
        ),
      );
      expect(issues).toEqual([expect.objectContaining({ path: ['states', 0, 'exact'], from: 8, to: 9 })]);
    });
  });

  describe('parameters', () => {
    it('reports a cycle through several parameters with its route', () => {
      const issues = checkSheet(
        ouWith({
          id: 'p2',
          kind: 'params',
          params: [
            { name: 'a', value: 'b + 1' },
            { name: 'b', value: '2 * c' },
            { name: 'c', value: 'a - mu' },
          ],
        }),
      );
      expect(issues).toEqual([
        {
          cellId: 'p2',
          path: ['params', 0, 'value'],
          message: "parameter 'a' depends on itself through b → c → a",
        },
      ]);
    });

    it('reports a parameter that reads itself', () => {
      const issues = checkSheet(
        ouWith({ id: 'p2', kind: 'params', params: [{ name: 'a', value: 'a + 1' }] }),
      );
      expect(messages(issues)).toEqual(["parameter 'a' depends on itself"]);
    });

    it('checks min ≤ value ≤ max for numbers', () => {
      const issues = checkSheet(
        ouWith({
          id: 'p2',
          kind: 'params',
          params: [
            { name: 'lo', value: -1, min: 0 },
            { name: 'hi', value: 11, max: 10 },
            { name: 'bad', value: 1, min: 3, max: 2 },
            { name: 'fine', value: 2, min: 2, max: 2 },
          ],
        }),
      );
      expect(issues).toEqual([
        { cellId: 'p2', path: ['params', 0, 'value'], message: "'lo' is -1, below its minimum 0" },
        { cellId: 'p2', path: ['params', 1, 'value'], message: "'hi' is 11, above its maximum 10" },
        {
          cellId: 'p2',
          path: ['params', 2, 'max'],
          message: "the maximum of 'bad' (2) is below its minimum (3)",
        },
      ]);
    });

    it('reports a parameter whose expression is not finite', () => {
      const issues = checkSheet(
        ouWith({ id: 'p2', kind: 'params', params: [{ name: 'a', value: 'log(mu - 0.4)' }] }),
      );
      expect(messages(issues)).toEqual(["parameter 'a' evaluates to -Infinity, not a finite number"]);
    });
  });

  describe('model', () => {
    it('rejects a diffusion key that is not a noise source', () => {
      const issues = checkSheet(
        ouWith(
          modelCell({ states: [{ name: 'x', initial: '1', drift: '0', diffusion: { W: '1', V: '2' } }] }),
        ),
      );
      expect(issues).toEqual([
        {
          cellId: 'm',
          path: ['states', 0, 'diffusion', 'V'],
          message: "'V' is not a noise source of this model; the noise sources are: W",
        },
      ]);
    });

    it('rejects an initial value that is not finite', () => {
      const issues = checkSheet(
        ouWith(modelCell({ states: [{ name: 'x', initial: 'sqrt(-mu)', drift: '0', diffusion: {} }] })),
      );
      expect(messages(issues)).toEqual(["the initial value of 'x' evaluates to NaN"]);
    });

    const twoNoises = (correlation: number[][]) =>
      modelCell({
        states: [
          { name: 'x', initial: '1', drift: '-x', diffusion: { U: '1' } },
          { name: 'y', initial: '1', drift: '-y', diffusion: { V: '1' } },
        ],
        noises: [{ name: 'U' }, { name: 'V' }],
        correlation,
      });

    it('accepts a valid correlation matrix', () => {
      expect(
        checkSheet(
          ouWith(
            twoNoises([
              [1, -0.6],
              [-0.6, 1],
            ]),
          ),
        ),
      ).toEqual([]);
    });

    it('rejects a correlation matrix of the wrong shape', () => {
      expect(checkSheet(ouWith(twoNoises([[1]])))).toEqual([
        {
          cellId: 'm',
          path: ['correlation'],
          message: 'the correlation matrix must be 2 × 2: one row and one column per noise source',
        },
      ]);
    });

    it('rejects an asymmetric correlation matrix', () => {
      expect(
        messages(
          checkSheet(
            ouWith(
              twoNoises([
                [1, 0.2],
                [0.3, 1],
              ]),
            ),
          ),
        ),
      ).toEqual(['entries (1, 2) and (2, 1) differ; the correlation matrix must be symmetric']);
    });

    it('rejects a diagonal entry other than 1', () => {
      expect(
        checkSheet(
          ouWith(
            twoNoises([
              [2, 0],
              [0, 1],
            ]),
          ),
        ),
      ).toEqual([{ cellId: 'm', path: ['correlation', 0, 0], message: 'diagonal entry (1, 1) must be 1' }]);
    });

    it('rejects entries outside [−1, 1]', () => {
      expect(
        messages(
          checkSheet(
            ouWith(
              twoNoises([
                [1, 1.5],
                [1.5, 1],
              ]),
            ),
          ),
        ),
      ).toEqual(['entry (1, 2) must lie between −1 and 1', 'entry (2, 1) must lie between −1 and 1']);
    });

    it('rejects a correlation matrix that is not positive definite', () => {
      // Perfect correlation is singular: det = 1 − ρ² = 0.
      expect(
        messages(
          checkSheet(
            ouWith(
              twoNoises([
                [1, 1],
                [1, 1],
              ]),
            ),
          ),
        ),
      ).toEqual(['the correlation matrix is not positive definite']);
      // Pairwise valid but jointly impossible: det = 1 − 3·0.81 − 2·0.729 < 0 (hand computed).
      const three = modelCell({
        states: [{ name: 'x', initial: '1', drift: '-x', diffusion: { U: '1', V: '1', Z: '1' } }],
        noises: [{ name: 'U' }, { name: 'V' }, { name: 'Z' }],
        correlation: [
          [1, 0.9, 0.9],
          [0.9, 1, -0.9],
          [0.9, -0.9, 1],
        ],
      });
      expect(messages(checkSheet(ouWith(three)))).toEqual([
        'the correlation matrix is not positive definite',
      ]);
    });
  });

  describe('simulation', () => {
    it('rejects a missing model and a reference to a cell of another kind', () => {
      expect(checkSheet(ouWith(simulationCell({ model: 'nope' })))).toContainEqual({
        cellId: 'run',
        path: ['model'],
        message: "there is no cell 'nope'",
      });
      expect(checkSheet(ouWith(simulationCell({ model: 'p' })))).toContainEqual({
        cellId: 'run',
        path: ['model'],
        message: "cell 'p' is a params cell, not a model cell",
      });
    });

    it('wants exactly one of steps and step size', () => {
      expect(messages(checkSheet(ouWith(simulationCell({ steps: 100 }))))).toEqual([
        'give either a number of steps or a step size, not both',
      ]);
      expect(messages(checkSheet(ouWith(simulationCell({ stepSize: undefined }))))).toEqual([
        'give a number of steps or a step size',
      ]);
    });

    it('applies the step cap to the step count a step size resolves to', () => {
      // t1 = 3 with h = 1e-7 resolves to 3·10^7 steps, beyond the 10^7 cap on `steps` itself.
      expect(checkSheet(ouWith(simulationCell({ stepSize: 1e-7 })))).toContainEqual({
        cellId: 'run',
        path: ['stepSize'],
        message:
          'a step size of 1e-7 over [0, 3] gives 30,000,000 steps, more than the limit of 10,000,000; use a larger step size',
      });
      expect(messages(checkSheet(ouWith(simulationCell({ stepSize: 3e-7 }))))).toEqual([]);
    });

    it('wants t1 after t0', () => {
      expect(checkSheet(ouWith(simulationCell({ t0: 3, t1: 3 })))).toContainEqual({
        cellId: 'run',
        path: ['t1'],
        message: 'the end time (3) must be after the start time (3)',
      });
    });

    it('rejects overrides of unknown parameters', () => {
      expect(checkSheet(ouWith(simulationCell({ overrides: { mu: 1, kappa: 2 } })))).toEqual([
        { cellId: 'run', path: ['overrides', 'kappa'], message: "there is no parameter 'kappa' to override" },
      ]);
    });

    it('rejects boundaries on names that are not states', () => {
      expect(
        checkSheet(ouWith(simulationCell({ boundaries: { y: { rule: 'reflect', level: 0 } } }))),
      ).toEqual([
        {
          cellId: 'run',
          path: ['boundaries', 'y'],
          message: "'y' is not a state variable of model 'm'; its states are: x",
        },
      ]);
    });

    const sharedNoise = modelCell({
      states: [
        { name: 'x', initial: '1', drift: '-x', diffusion: { W: 'sigma' } },
        { name: 'y', initial: '1', drift: '-y', diffusion: { W: 'sigma', V: '0.1' } },
      ],
      noises: [{ name: 'W' }, { name: 'V' }],
    });

    it('allows Milstein only for scalar or diagonal noise', () => {
      const issues = checkSheet(ouWith(sharedNoise, simulationCell({ method: 'milstein' })));
      expect(issues).toEqual([
        {
          cellId: 'run',
          path: ['method'],
          message: expect.stringMatching(/^Milstein needs scalar noise .*use Euler–Maruyama$/),
        },
      ]);
      // Scalar noise felt by two states is fine, and so is diagonal noise.
      const scalar = modelCell({
        states: [
          { name: 'x', initial: '1', drift: '-x', diffusion: { W: 'sigma' } },
          { name: 'y', initial: '1', drift: '-y', diffusion: { W: 'sigma * y' } },
        ],
      });
      expect(checkSheet(ouWith(scalar, simulationCell({ method: 'milstein' })))).toEqual([]);
      const diagonal = modelCell({
        states: [
          { name: 'x', initial: '1', drift: '-x', diffusion: { W: 'sigma', V: '0' } },
          { name: 'y', initial: '1', drift: '-y', diffusion: { V: '0.1' } },
        ],
        noises: [{ name: 'W' }, { name: 'V' }],
      });
      expect(checkSheet(ouWith(diagonal, simulationCell({ method: 'milstein' })))).toEqual([]);
    });

    it('refuses Milstein with correlated noise sources', () => {
      const correlated = modelCell({
        states: [
          { name: 'x', initial: '1', drift: '-x', diffusion: { W: 'sigma' } },
          { name: 'y', initial: '1', drift: '-y', diffusion: { V: '0.1' } },
        ],
        noises: [{ name: 'W' }, { name: 'V' }],
        correlation: [
          [1, 0.5],
          [0.5, 1],
        ],
      });
      expect(messages(checkSheet(ouWith(correlated, simulationCell({ method: 'milstein' }))))).toEqual([
        "Milstein needs independent noise sources, and model 'm' correlates them: use Euler–Maruyama",
      ]);
    });

    it('pairs stochastic Heun with Stratonovich and the Itô schemes with Itô', () => {
      expect(messages(checkSheet(ouWith(simulationCell({ method: 'heun' }))))).toEqual([
        "stochastic Heun solves the Stratonovich form, and model 'm' is written in Itô form: use Euler–Maruyama or Milstein, or set the model's calculus to Stratonovich",
      ]);
      const stratonovich = modelCell({ calculus: 'stratonovich' });
      expect(messages(checkSheet(ouWith(stratonovich)))).toEqual([
        "Euler–Maruyama solves the Itô form, and model 'm' is written in Stratonovich form: use stochastic Heun, or rewrite the model in Itô form",
      ]);
      expect(messages(checkSheet(ouWith(stratonovich, simulationCell({ method: 'milstein' }))))).toEqual([
        expect.stringMatching(/^Milstein solves the Itô form/),
      ]);
      expect(checkSheet(ouWith(stratonovich, simulationCell({ method: 'heun' })))).toEqual([]);
    });
  });

  describe('charts, probes and studies', () => {
    it('rejects a missing simulation', () => {
      expect(
        checkSheet(ouWith({ id: 'fan', kind: 'chart', simulation: 'gone', view: 'fan', state: 'x' })),
      ).toEqual([{ cellId: 'fan', path: ['simulation'], message: "there is no cell 'gone'" }]);
      expect(checkSheet(ouWith({ id: 's', kind: 'study', simulation: 'm' }))).toEqual([
        { cellId: 's', path: ['simulation'], message: "cell 'm' is a model cell, not a simulation cell" },
      ]);
    });

    it('rejects state names the model does not have', () => {
      expect(
        checkSheet(ouWith({ id: 'high', kind: 'probe', simulation: 'run', quantity: 'mean', state: 'z' })),
      ).toEqual([
        {
          cellId: 'high',
          path: ['state'],
          message: "'z' is not a state variable of model 'm'; its states are: x",
        },
      ]);
      expect(checkSheet(ouWith({ id: 's', kind: 'study', simulation: 'run', state: 'q' }))).toEqual([
        expect.objectContaining({ cellId: 's', path: ['state'] }),
      ]);
    });

    it.each(['exceedance', 'subceedance', 'hit-before', 'first-passage'] as const)(
      'wants a level for %s',
      (quantity) => {
        const issues = checkSheet(
          ouWith({ id: 'high', kind: 'probe', simulation: 'run', quantity, state: 'x' }),
        );
        expect(issues).toEqual([
          { cellId: 'high', path: ['level'], message: expect.stringMatching(/needs a level$/) },
        ]);
      },
    );

    it('wants a probability for a quantile', () => {
      expect(
        checkSheet(
          ouWith({ id: 'high', kind: 'probe', simulation: 'run', quantity: 'quantile', state: 'x' }),
        ),
      ).toEqual([
        { cellId: 'high', path: ['probability'], message: 'a quantile needs a probability between 0 and 1' },
      ]);
      expect(
        checkSheet(
          ouWith({
            id: 'high',
            kind: 'probe',
            simulation: 'run',
            quantity: 'quantile',
            state: 'x',
            probability: 0.9,
          }),
        ),
      ).toEqual([]);
    });

    it('wants a level or an absorbing lower boundary for extinction', () => {
      const probe = {
        id: 'high',
        kind: 'probe',
        simulation: 'run',
        quantity: 'extinction',
        state: 'x',
      } as const;
      expect(messages(checkSheet(ouWith(probe)))).toEqual([
        "extinction needs a level, or an absorbing lower boundary on 'x' in simulation 'run'",
      ]);
      expect(
        checkSheet(ouWith(probe, simulationCell({ boundaries: { x: { rule: 'absorb', level: 0 } } }))),
      ).toEqual([]);
    });

    it('rejects a probe time outside the simulated interval', () => {
      expect(
        checkSheet(
          ouWith({ id: 'high', kind: 'probe', simulation: 'run', quantity: 'mean', state: 'x', time: 4 }),
        ),
      ).toEqual([
        { cellId: 'high', path: ['time'], message: 'the time 4 lies outside the simulated interval [0, 3]' },
      ]);
    });

    it('wants a second state for a phase chart', () => {
      expect(
        checkSheet(ouWith({ id: 'fan', kind: 'chart', simulation: 'run', view: 'phase', state: 'x' })),
      ).toEqual([
        { cellId: 'fan', path: ['stateY'], message: 'a phase chart needs a second state variable' },
      ]);
      expect(
        checkSheet(
          ouWith({ id: 'fan', kind: 'chart', simulation: 'run', view: 'phase', state: 'x', stateY: 'y' }),
        ),
      ).toEqual([expect.objectContaining({ cellId: 'fan', path: ['stateY'] })]);
    });

    it('wants a second, existing and different state for a covariance or correlation probe', () => {
      const probe = { id: 'high', kind: 'probe' as const, simulation: 'run', state: 'x' };
      expect(checkSheet(ouWith({ ...probe, quantity: 'covariance' }))).toEqual([
        { cellId: 'high', path: ['stateY'], message: 'a covariance needs a second state variable' },
      ]);
      expect(checkSheet(ouWith({ ...probe, quantity: 'correlation', stateY: 'x' }))).toEqual([
        { cellId: 'high', path: ['stateY'], message: 'a correlation needs two different state variables' },
      ]);
      expect(checkSheet(ouWith({ ...probe, quantity: 'correlation', stateY: 'y' }))).toEqual([
        expect.objectContaining({ cellId: 'high', path: ['stateY'] }),
      ]);
    });

    it('wants an exact solution for an exact study reference', () => {
      const noExact = modelCell({
        states: [{ name: 'x', initial: '1', drift: '-x', diffusion: { W: 'sigma' } }],
      });
      expect(
        checkSheet(ouWith(noExact, { id: 's', kind: 'study', simulation: 'run', reference: 'exact' })),
      ).toEqual([
        {
          cellId: 's',
          path: ['reference'],
          message: "an exact reference needs an exact solution for 'x'; use 'finest' or 'auto'",
        },
      ]);
      const withExact = modelCell({
        states: [
          {
            name: 'x',
            initial: '1',
            drift: 'mu * x',
            diffusion: { W: 'sigma * x' },
            exact: 'x * exp((mu - sigma ** 2 / 2) * t + sigma * W)',
          },
        ],
      });
      expect(
        checkSheet(ouWith(withExact, { id: 's', kind: 'study', simulation: 'run', reference: 'exact' })),
      ).toEqual([]);
    });
  });
});
