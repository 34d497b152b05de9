/**
 * The command line as a function: takes argv and output streams, returns an exit code.
 * Commander wiring only; the work lives in the stage folders.
 *
 * Exit codes: 0 success (every claim got its expected verdict), 1 some claim did not,
 * 2 bad usage or input that could not be read or parsed (a message, never a stack trace).
 */
import { Command, CommanderError, Option } from 'commander';
import { ModvetError } from '../numeric/errors.js';
import { checkDigits } from '../numeric/precision.js';
import { demoLines } from './demo.js';
import { CheckFlags, runCheck } from './check.js';
import { runWatch } from './watch.js';
import { runList } from './list.js';
import { EvalFlags, runEval } from './eval.js';
import { PlotFlags, runPlot } from './plot.js';
import { TexFlags, runTex } from './tex.js';
import { UsageError } from './options.js';
import { VERSION } from './version.js';

export { VERSION };

export interface Streams {
  out: (s: string) => void;
  err: (s: string) => void;
  /** Whether to colour stdout (a terminal, and NO_COLOR unset): decided by the caller. */
  color?: boolean;
  /** The folder paths are relative to (default: process.cwd()). */
  cwd?: string;
  /** Whether to draw a progress line on `err` (a terminal): decided by the caller. */
  progress?: boolean;
  /** Width of the terminal `err` writes to. */
  columns?: number;
}

const HELP_CONVENTIONS = `
Conventions: tau = x + iy, q = e^{2 pi i tau}; theta functions use the nome e^{pi i tau};
lap(f) = y^2 (d_x^2 + d_y^2), so lap(y^s) = s(s-1) y^s; Ens(s, tau) is the coset-normalised
non-holomorphic Eisenstein series (constant term y^s + ...), Estar = xi(2s) Ens.
Numerical agreement at random points is evidence, not proof.`;

export async function run(argv: string[], io: Streams): Promise<number> {
  const program = new Command();
  const cwd = io.cwd ?? process.cwd();
  let code = 0;
  program
    .name('modvet')
    .description('Numerical verification of identities between modular forms.')
    .version(VERSION)
    .exitOverride()
    .configureOutput({ writeOut: io.out, writeErr: io.err })
    .addHelpText('after', HELP_CONVENTIONS);

  program
    .command('check')
    .description('check the claims in .vet files (folders are searched recursively; default identities/)')
    .argument('[paths...]', 'claim files or folders')
    .option('-d, --digits <n>', 'significant digits to check (5..2000; default 30)')
    .option('-n, --samples <n>', 'sample points per claim (default 16: 8 in F, 8 near the real axis)')
    .option('-s, --seed <n>', 'seed of the random samples (default 1); the summary prints it')
    .option('--ymin <y>', 'smallest Im tau sampled (default 0.02)')
    .option('--only <pattern>', 'only claims whose name matches (substring, or * wildcards)')
    .option('--json', 'print a JSON report (schema modvet-check/1) on stdout')
    .option('--junit <file>', 'also write a JUnit XML report to <file>')
    .option('--report <file>', 'also write an HTML report to <file>: a table of the claims, and per claim both sides along a path and the residual at each sample')
    .option('-q, --quiet', 'print only the claims that did not get their expected verdict')
    .option('--fix', 'write the suggested fixes that hold to <file>.fixed.vet beside each file (never overwrites)')
    .option('-j, --jobs <n>', 'check claims on n worker threads (default: the number of cores); the report is the same for every n')
    .option('--shard <k/n>', 'check only the k-th of n parts of the claims (every n-th claim from the k-th), for a CI matrix')
    .option('--watch', 'check, then check a file again whenever it changes (Ctrl-C to stop)')
    .action(async (paths: string[], flags: CheckFlags & { watch?: boolean }) => {
      code = flags.watch === true ? await runWatch(paths, flags, io, cwd) : await runCheck(paths, flags, io, cwd);
    });

  program
    .command('list')
    .description('list the claims in .vet files with their clauses')
    .argument('[paths...]', 'claim files or folders (default identities/)')
    .action((paths: string[]) => {
      code = runList(paths, io, cwd);
    });

  program
    .command('eval')
    .description('evaluate one expression, correctly rounded, e.g. eval "E(4, tau)^2" --at "tau=0.1+1.2i"')
    .argument('<expression>', 'an expression of the claim language')
    .option('--at <name=value>', 'a value for tau or a parameter (repeatable)', (v: string, prev: string[] = []) => [...prev, v])
    .option('-d, --digits <n>', 'significant digits (5..2000; default 30)')
    .option('--ymin <y>', 'smallest Im tau the built-ins accept (default 0.02)')
    .option('--json', 'print {"re": "...", "im": "..."}')
    .action((expression: string, flags: EvalFlags) => {
      code = runEval(expression, flags, io);
    });

  program
    .command('plot')
    .description('plot one or two expressions along a path in the upper half plane to an SVG file, with log10 |f - g| below, e.g. plot "E(4, tau)^2" "E(8, tau)" --path "x=0.1, y=0.5..3" --out e8.svg')
    .argument('<expressions...>', 'one or two expressions of the claim language (f, and g to compare with)')
    .option('--path <path>', 'x fixed and y running, "x=-0.4, y=0.5..3", or y fixed and x running, "y=1.2, x=-0.5..0.5"')
    .option('-o, --out <file>', 'the SVG file to write (required; never a .vet file)')
    .option('--points <n>', 'sample points along the path (2..10000; default 120)')
    .option('-d, --digits <n>', 'significant digits of each value (5..2000; default 20)')
    .option('--at <name=value>', 'a value for a parameter (repeatable; tau comes from --path)', (v: string, prev: string[] = []) => [...prev, v])
    .option('--ymin <y>', 'smallest Im tau the built-ins accept (default 0.02)')
    .action((expressions: string[], flags: PlotFlags) => {
      code = runPlot(expressions, flags, io, cwd);
    });

  program
    .command('tex')
    .description('check the claims as `check` does and write the LaTeX of those that hold (the others are listed on stderr)')
    .argument('[paths...]', 'claim files or folders (default identities/)')
    .option('-d, --digits <n>', 'significant digits to check (5..2000; default 30)')
    .option('-n, --samples <n>', 'sample points per claim (default 16)')
    .option('-s, --seed <n>', 'seed of the random samples (default 1)')
    .option('--ymin <y>', 'smallest Im tau sampled (default 0.02)')
    .option('--only <pattern>', 'only claims whose name matches (substring, or * wildcards)')
    .option('-o, --out <file>', 'write the LaTeX to <file> instead of stdout (never a .vet file)')
    .option('--standalone', 'a whole document (article, amsmath, amssymb) instead of a fragment to \\input')
    .option('-j, --jobs <n>', 'check claims on n worker threads (default: the number of cores)')
    .action(async (paths: string[], flags: TexFlags) => {
      code = await runTex(paths, flags, io, cwd);
    });

  program
    .command('demo')
    .description('print constants and special-function values computed by the numeric layer')
    .addOption(new Option('-d, --digits <n>', 'significant digits (5..2000)').default('50'))
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
    } else if (e instanceof ModvetError || e instanceof UsageError) {
      io.err(`modvet: ${e.message}\n`);
      code = 2;
    } else {
      throw e;
    }
  }
  return code;
}
