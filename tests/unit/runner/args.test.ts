import { describe, expect, it } from 'vitest';
import { parseArguments, UsageError } from '../../../server/cli/args';

describe('runner arguments', () => {
  it('reads a run with a file, a worker count and a path scale', () => {
    expect(parseArguments(['run', 'sheet.json', '--workers', '3', '--paths-scale=0.25'])).toEqual({
      command: 'run',
      file: 'sheet.json',
      workers: 3,
      pathsScale: 0.25,
      kernel: 'auto',
    });
    expect(parseArguments(['run', '--workers=1', 'a.json'])).toMatchObject({
      file: 'a.json',
      workers: 1,
      pathsScale: null,
    });
  });

  it('reads the kernel choice for run and verify', () => {
    expect(parseArguments(['run', 'a.json', '--kernel', 'wasm'])).toMatchObject({ kernel: 'wasm' });
    expect(parseArguments(['run', 'a.json', '--kernel=js'])).toMatchObject({ kernel: 'js' });
    expect(parseArguments(['verify', 'a.json', '--digests', 'd.json', '--kernel', 'auto'])).toMatchObject({
      kernel: 'auto',
    });
  });

  it('treats no command and --help as a request for help', () => {
    expect(parseArguments([])).toEqual({ command: 'help' });
    expect(parseArguments(['--help'])).toEqual({ command: 'help' });
  });

  it.each([
    [['simulate', 'a.json'], /unknown command "simulate"/],
    [['run'], /needs a sheet file/],
    [['run', 'a.json', 'b.json'], /only one sheet file/],
    [['run', 'a.json', '--workers'], /--workers needs a value/],
    [['run', 'a.json', '--workers', '0'], /positive whole number, got "0"/],
    [['run', 'a.json', '--workers', '2.5'], /positive whole number/],
    [['run', 'a.json', '--paths-scale', '-1'], /--paths-scale must be a positive number/],
    [['run', 'a.json', '--fast'], /unknown option "--fast"/],
    [['run', 'a.json', '--kernel', 'gpu'], /--kernel must be js, wasm or auto, got "gpu"/],
    [['run', 'a.json', '--kernel'], /--kernel must be js, wasm or auto/],
  ])('rejects %j with a usage error', (argv, message) => {
    expect(() => parseArguments(argv)).toThrow(UsageError);
    expect(() => parseArguments(argv)).toThrow(message);
  });
});
