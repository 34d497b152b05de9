/**
 * `npm run bench`: median microseconds per evaluation, modvet beside mpmath, same
 * seeded arguments, same run. See bench/harness.ts for the timing method.
 */
import { Complex } from '../src/numeric/complex.js';
import { Random } from '../src/numeric/random.js';
import { BenchRow, mpmathVersion, printTable, timeMpmath, timeRow, Timing } from './harness.js';

const PRECISIONS = [30, 50, 100];
const ARGS_PER_ROW = 6;

const rng = new Random('modvet-bench-1');
const num = (x: number) => x.toPrecision(12);
function complexArgs(n: number, reLo: number, reHi: number, imLo: number, imHi: number): [string, string][] {
  return Array.from({ length: n }, () => [num(rng.uniform(reLo, reHi)), num(rng.uniform(imLo, imHi))]);
}
const cx = (a: [string, string]) => new Complex(a[0], a[1]);

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
];

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

main();
