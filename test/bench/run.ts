/**
 * `npm run bench`: median microseconds per evaluation, modvet beside mpmath, same
 * seeded arguments, same run. See test/bench/harness.ts for the timing method.
 */
import { spawn } from 'node:child_process';
import { Decimal } from 'decimal.js';
import { Complex } from '../../src/numeric/complex.js';
import { Random } from '../../src/numeric/random.js';
import { gamma, logGamma } from '../../src/special/gamma.js';
import { zeta } from '../../src/special/zeta.js';
import { dirichletBeta } from '../../src/special/dirichletBeta.js';
import { besselK } from '../../src/special/besselK.js';
import { gammaUpper } from '../../src/special/incompleteGamma.js';
import { eisensteinE } from '../../src/modular/eisenstein.js';
import { eta } from '../../src/modular/eta.js';
import { kleinJ } from '../../src/modular/kleinJ.js';
import { nonholomorphicE } from '../../src/modular/nonholomorphic.js';
import { run } from '../../src/cli/program.js';
import { BenchRow, mpmathVersion, printTable, timeMpmath, timeRow, Timing } from './harness.js';

const PRECISIONS = [30, 50, 100];
const ARGS_PER_ROW = 6;

const rng = new Random('modvet-bench-1');
const num = (x: number) => x.toPrecision(12);
function complexArgs(n: number, reLo: number, reHi: number, imLo: number, imHi: number): [string, string][] {
  return Array.from({ length: n }, () => [num(rng.uniform(reLo, reHi)), num(rng.uniform(imLo, imHi))]);
}
const cx = (a: [string, string]) => new Complex(a[0], a[1]);
const re = (a: [string, string]) => new Decimal(a[0]);
/** Pairs [complex, positive real] from two independent draws. */
function withPositive(zs: [string, string][], lo: number, hi: number): [string, string][][] {
  const xs = positive(zs.length, lo, hi);
  return zs.map((z, i) => [z, xs[i]!]);
}
function positive(n: number, lo: number, hi: number): [string, string][] {
  // log-uniform in [lo, hi]
  return Array.from({ length: n }, () => [num(Math.exp(rng.uniform(Math.log(lo), Math.log(hi)))), '0']);
}
/** Points tau = x + iy with |x| <= 1/2 and y in [yLo, yHi]. */
function taus(n: number, yLo: number, yHi: number): [string, string][] {
  return complexArgs(n, -0.5, 0.5, yLo, yHi);
}
const HIGH: [number, number] = [0.87, 2];
const LOW: [number, number] = [0.05, 0.3];
const setName = (r: [number, number]) => `Im tau in [${r[0]}, ${r[1]}]`;

function modularRows(): BenchRow[] {
  const out: BenchRow[] = [];
  for (const band of [HIGH, LOW]) {
    const pts = () => taus(ARGS_PER_ROW, band[0], band[1]).map((t) => [t]);
    out.push(
      { label: 'E_4(tau)', set: setName(band), mpmath: 'E4', args: pts(), run: (a) => eisensteinE(4, cx(a[0]!)) },
      { label: 'E_12(tau)', set: setName(band), mpmath: 'E12', args: pts(), run: (a) => eisensteinE(12, cx(a[0]!)) },
      { label: 'eta(tau)', set: setName(band), mpmath: 'eta', args: pts(), run: (a) => eta(cx(a[0]!)) },
      { label: 'j(tau)', set: setName(band), mpmath: 'j', args: pts(), run: (a) => kleinJ(cx(a[0]!)) },
    );
    for (const s of [['2.5', '0'], ['0.7', '3.1']] as [string, string][]) {
      out.push({
        label: `E(${s[1] === '0' ? s[0] : `${s[0]}+${s[1]}i`}, tau)`,
        set: setName(band),
        mpmath: 'Efourier',
        // the mpmath side needs seconds per call near the axis: fewer points there
        args: taus(band === LOW ? 3 : ARGS_PER_ROW, band[0], band[1]).map((t) => [s, t]),
        run: (a) => nonholomorphicE(cx(a[0]!), cx(a[1]!)),
      });
    }
  }
  return out;
}

const rows: BenchRow[] = [
  {
    label: 'exp(z)',
    mpmath: 'exp',
    args: complexArgs(ARGS_PER_ROW, -20, 20, -20, 20).map((z) => [z]),
    run: (a) => cx(a[0]!).exp(),
  },
  {
    label: 'log(z)',
    mpmath: 'log',
    args: complexArgs(ARGS_PER_ROW, -20, 20, -20, 20).map((z) => [z]),
    run: (a) => cx(a[0]!).log(),
  },
  {
    label: 'Gamma(z)',
    mpmath: 'gamma',
    args: complexArgs(ARGS_PER_ROW, 0.5, 20, -30, 30).map((z) => [z]),
    run: (a) => gamma(cx(a[0]!)),
  },
  {
    label: 'logGamma(z)',
    mpmath: 'loggamma',
    args: complexArgs(ARGS_PER_ROW, -10, 20, -30, 30).map((z) => [z]),
    run: (a) => logGamma(cx(a[0]!)),
  },
  {
    label: 'zeta(s)',
    mpmath: 'zeta',
    args: complexArgs(ARGS_PER_ROW, -2, 4, -30, 30).map((z) => [z]),
    run: (a) => zeta(cx(a[0]!)),
  },
  {
    label: 'beta(s)',
    mpmath: 'dirichletbeta',
    args: complexArgs(ARGS_PER_ROW, 0, 5, -20, 20).map((z) => [z]),
    run: (a) => dirichletBeta(cx(a[0]!)),
  },
  {
    label: 'K_nu(x)',
    mpmath: 'besselk',
    args: withPositive(complexArgs(ARGS_PER_ROW, -3, 3, -10, 10), 0.05, 30),
    run: (a) => besselK(cx(a[0]!), re(a[1]!)),
  },
  {
    label: 'Gamma(a, x)',
    mpmath: 'gammainc',
    args: withPositive(complexArgs(ARGS_PER_ROW, -3, 6, -5, 5), 0.5, 40),
    run: (a) => gammaUpper(cx(a[0]!), re(a[1]!)),
  },
  ...modularRows(),
];

/**
 * The whole shipped library at the default settings (30 digits, 16 samples), in-process,
 * with one worker thread and with two: the speed-up of --jobs 2 on this machine's cores.
 */
async function libraryTiming(): Promise<void> {
  const once = async (jobs: number) => {
    let out = '';
    const t0 = performance.now();
    const code = await run(['check', 'identities', '--json', '--jobs', String(jobs)], { out: (x) => (out += x), err: () => {} });
    const secs = (performance.now() - t0) / 1000;
    const doc = JSON.parse(out) as { summary: { claims: number; unexpected: number } };
    return { secs, code, n: doc.summary.claims, unexpected: doc.summary.unexpected, out };
  };
  const one = await once(1);
  const two = await once(2);
  console.log(`\nmodvet check identities/ (30 digits, 16 samples, seed 1), ${one.n} claims:`);
  for (const [j, r] of [[1, one], [2, two]] as const) {
    console.log(`  --jobs ${j}: ${r.secs.toFixed(1)} s, ${(r.n / r.secs).toFixed(1)} claims per second; exit code ${r.code}, ${r.unexpected} not as expected`);
  }
  console.log(`  speed-up of --jobs 2: ${(one.secs / two.secs).toFixed(2)}x; reports identical: ${one.out === two.out ? 'yes' : 'NO'}`);
  const m = await machineCeiling();
  console.log(
    `  this machine's own ceiling: two CPU-bound processes (a plain integer loop) take ${m.pair.toFixed(1)} s side by side ` +
      `against ${m.single.toFixed(1)} s for one, i.e. ${((2 * m.single) / m.pair).toFixed(2)}x the throughput of one core`,
  );
}

/** Wall time of a plain integer loop in a child process, alone and as two side by side. */
async function machineCeiling(): Promise<{ single: number; pair: number }> {
  const loop = 'let x = 0; for (let i = 0; i < 2e8; i++) x = (x * 1103515245 + 12345) % 2147483648; if (x < 0) console.log(x);';
  const child = () =>
    new Promise<void>((resolve, reject) => {
      const p = spawn(process.execPath, ['-e', loop], { stdio: 'ignore' });
      p.on('exit', () => resolve());
      p.on('error', reject);
    });
  let t = performance.now();
  await child();
  const single = (performance.now() - t) / 1000;
  t = performance.now();
  await Promise.all([child(), child()]);
  return { single, pair: (performance.now() - t) / 1000 };
}

function main(): void {
  const version = mpmathVersion();
  console.log(`modvet bench: median us per evaluation over ${ARGS_PER_ROW} seeded arguments per row`);
  console.log(version === null ? 'mpmath: not available (install python3-mpmath); ratios omitted' : `mpmath ${version}`);
  const mp = timeMpmath(rows, PRECISIONS);
  const ts: Timing[] = [];
  rows.forEach((row, i) => {
    for (const d of PRECISIONS) {
      ts.push({
        label: row.label,
        set: row.set ?? '',
        digits: d,
        modvetUs: timeRow(row, d),
        mpmathUs: mp?.get(`${i}@${d}`) ?? null,
      });
    }
  });
  printTable(ts);
}

// `npm run bench -- --library` times only the library check
if (!process.argv.includes('--library')) main();
await libraryTiming();
