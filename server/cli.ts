import { parseArguments, USAGE, UsageError } from './cli/args';
import { EXIT_USAGE, runCommand } from './cli/run-command';
import { verifyCommand } from './cli/verify-command';

/**
 * The headless runner: `npm run --silent sheet -- run <file.json> [--workers N] [--paths-scale F]`,
 * and `verify <file.json> --digests <digests.json>` to rerun and compare with saved digests.
 * stdout carries only the result JSON, so it can be piped; everything else goes to stderr.
 */
async function main(argv: string[]): Promise<number> {
  let args;
  try {
    args = parseArguments(argv);
  } catch (error) {
    if (!(error instanceof UsageError)) throw error;
    console.error(`${error.message}\n\n${USAGE}`);
    return EXIT_USAGE;
  }
  if (args.command === 'help') {
    console.error(USAGE);
    return 0;
  }
  const outcome =
    args.command === 'verify'
      ? await verifyCommand(args)
      : await runCommand(args, (line) => console.error(line));
  for (const line of outcome.stderr) console.error(line);
  if (outcome.stdout) process.stdout.write(`${outcome.stdout}\n`);
  return outcome.exitCode;
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    console.error(error instanceof Error ? (error.stack ?? error.message) : String(error));
    process.exitCode = 1;
  },
);
