/**
 * The command line as a function: takes argv and output streams, returns an exit code.
 * Commander wiring only; the work lives in the stage folders.
 *
 * Exit codes: 0 success, 2 bad usage or bad input (a message, never a stack trace).
 */
import { Command, CommanderError } from 'commander';
import { ModvetError } from '../numeric/errors.js';
import { checkDigits } from '../numeric/precision.js';
import { demoLines } from './demo.js';

export interface Streams {
  out: (s: string) => void;
  err: (s: string) => void;
}

export const VERSION = '0.1.0';

export async function run(argv: string[], io: Streams): Promise<number> {
  const program = new Command();
  let code = 0;
  program
    .name('modvet')
    .description('Numerical verification of identities between modular forms.')
    .version(VERSION)
    .exitOverride()
    .configureOutput({ writeOut: io.out, writeErr: io.err });

  program
    .command('demo')
    .description('print constants and special-function values computed by the numeric layer')
    .option('-d, --digits <n>', 'significant digits (5..2000)', '50')
    .action((opts: { digits: string }) => {
      const d = Number(opts.digits);
      checkDigits(d, '--digits');
      for (const line of demoLines(d)) io.out(line + '\n');
    });

  try {
    await program.parseAsync(argv, { from: 'user' });
  } catch (e) {
    if (e instanceof CommanderError) {
      // help and version requests end here too, with exit code 0
      code = e.exitCode === 0 ? 0 : 2;
    } else if (e instanceof ModvetError) {
      io.err(`modvet: ${e.message}\n`);
      code = 2;
    } else {
      throw e;
    }
  }
  return code;
}
