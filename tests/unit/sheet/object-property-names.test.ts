import { describe, expect, it } from 'vitest';
import { checkSheet } from '@shared/sheet';
import { reservedNameProblem } from '@shared/sheet/names';
import { modelCell, ouWith } from './fixtures';

const PROTOTYPE_NAMES = Object.getOwnPropertyNames(Object.prototype).filter((name) =>
  /^[A-Za-z_$][A-Za-z0-9_$]*$/.test(name),
);

describe('names that every object has', () => {
  it.each(PROTOTYPE_NAMES)("refuses '%s' as a name with a clear message", (name) => {
    expect(reservedNameProblem(name)).toMatch(/every JavaScript object|reserved word/);
  });

  it.each(['constructor', 'toString', 'valueOf', 'hasOwnProperty'])(
    "reports a state named '%s' in the checker",
    (name) => {
      const doc = ouWith(
        modelCell({ states: [{ name, initial: '1', drift: `-${name}`, diffusion: { W: 'sigma' } }] }),
      );
      expect(checkSheet(doc)).toContainEqual({
        cellId: 'm',
        path: ['states', 0, 'name'],
        message: `'${name}' is a property every JavaScript object has; choose another name`,
      });
    },
  );
});
