import { describe, expect, it } from 'vitest';
import {
  applyParamField,
  checkParamRow,
  nameProblem,
  type ParamRowText,
} from '@/components/cells/paramValidation';
import { RESERVED_NAMES } from '@/components/cells/expressionCheck';

const row = (over: Partial<ParamRowText>): ParamRowText => ({
  name: 'rate',
  value: '0.4',
  unit: '',
  min: '',
  max: '',
  description: '',
  ...over,
});
const context = { otherNames: ['capacity', 'harvest'], reserved: RESERVED_NAMES };

describe('parameter rows', () => {
  it('accepts a plain row', () => {
    expect(checkParamRow(row({}), context)).toEqual({});
  });

  it('rejects a name that is not a symbol, one already used and a reserved one', () => {
    expect(checkParamRow(row({ name: '2fast' }), context).name).toMatch(/not a valid name/);
    expect(checkParamRow(row({ name: 'capacity' }), context).name).toMatch(/already used/);
    expect(checkParamRow(row({ name: 'exp' }), context).name).toMatch(/reserved/);
    expect(nameProblem('  ', [], [])).toMatch(/needed/);
  });

  it('flags max below min on the max field', () => {
    expect(checkParamRow(row({ min: '5', max: '2' }), context).max).toMatch(/below min/);
  });

  it('accepts an expression of other parameters as a value, and explains a bad one', () => {
    expect(checkParamRow(row({ value: 'capacity / 2' }), context).value).toBeUndefined();
    expect(checkParamRow(row({ value: 'capacity ^ 2' }), context).value).toMatch(/\*\*/);
    expect(checkParamRow(row({ value: 'unknownThing + 1' }), context).value).toMatch(
      /Not a number, and not a valid expression/,
    );
  });

  it('flags a numeric value outside min..max', () => {
    expect(checkParamRow(row({ value: '9', min: '0', max: '1' }), context).value).toMatch(/above max/);
  });

  it('stores a valid field and refuses to store an invalid number', () => {
    const param = { name: 'rate', value: 0.4 };
    expect(applyParamField(param, 'min', '0.1', {})).toEqual({ name: 'rate', value: 0.4, min: 0.1 });
    expect(applyParamField(param, 'min', 'abc', { min: 'bad' })).toBeNull();
    expect(applyParamField(param, 'value', 'capacity / 3', {})).toEqual({
      name: 'rate',
      value: 'capacity / 3',
    });
    expect(applyParamField(param, 'unit', '', {})).toEqual(param);
  });
});

describe('parameter names in other alphabets', () => {
  it('accepts Greek letters and refuses a subscript digit with the rule', () => {
    expect(nameProblem('θ', [], RESERVED_NAMES)).toBeNull();
    expect(nameProblem('σ_x', [], RESERVED_NAMES)).toBeNull();
    expect(nameProblem('θ₁', [], RESERVED_NAMES)).toMatch(/subscript digits such as ₁: write θ1 or θ_1/);
  });
});
