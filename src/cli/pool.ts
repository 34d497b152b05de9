/**
 * Running the units of a check (unit.ts) on N worker threads, or inline for N = 1.
 *
 * Results are the same whatever N: each unit is computed from its own inputs (the claim's
 * samples come from the seed and the claim's file and name, never from a shared stream),
 * and the caller assembles them by index. Units are handed out one at a time, the costly
 * ones first (`cost`), so that a long claim does not start last and leave a core idle.
 *
 *   const outcomes = await runUnits(units, settings, 2, { cost, started, finished })
 */
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { runUnit, type Unit, type UnitOutcome, type UnitSettings } from './unit.js';

export interface PoolEvents {
  /** A unit began (for the progress display). */
  started?(u: Unit): void;
  /** A unit finished; called in completion order, not index order. */
  finished?(o: UnitOutcome): void;
  /** Larger runs earlier; units of equal cost keep their order. */
  cost?(u: Unit): number;
}

interface Reply {
  outcome?: UnitOutcome;
  error?: string;
}

/** The order in which units are handed out: costly first, otherwise as listed. */
function dispatchOrder(units: readonly Unit[], cost?: (u: Unit) => number): Unit[] {
  if (cost === undefined) return [...units];
  return units
    .map((u, k) => ({ u, k, c: cost(u) }))
    .sort((a, b) => b.c - a.c || a.k - b.k)
    .map((x) => x.u);
}

export async function runUnits(units: readonly Unit[], s: UnitSettings, jobs: number, ev: PoolEvents = {}): Promise<UnitOutcome[]> {
  const out: UnitOutcome[] = [];
  // worker threads run the built JavaScript; from the TypeScript sources (in-process
  // tests) there is none to start, and the units run inline with the same results
  const workerUrl = new URL('./worker.js', import.meta.url);
  const n = existsSync(fileURLToPath(workerUrl)) ? Math.max(1, Math.min(jobs, units.length)) : 1;
  if (n === 1) {
    for (const u of units) {
      ev.started?.(u);
      // let a pending progress repaint run between claims
      await new Promise((r) => setImmediate(r));
      const o = runUnit(u, s);
      out[o.index] = o;
      ev.finished?.(o);
    }
    return units.map((u) => out[u.index]!);
  }
  const queue = dispatchOrder(units, ev.cost);
  const workers: Worker[] = [];
  try {
    await Promise.all(
      Array.from({ length: n }, async () => {
        const w = new Worker(workerUrl);
        workers.push(w);
        for (let u = queue.shift(); u !== undefined; u = queue.shift()) {
          ev.started?.(u);
          const reply = await new Promise<Reply>((resolve, reject) => {
            w.once('message', (m: Reply) => resolve(m));
            w.once('error', reject);
            w.postMessage({ unit: u, settings: s });
          });
          w.removeAllListeners('error');
          if (reply.error !== undefined || reply.outcome === undefined) throw new Error(reply.error ?? 'a worker returned nothing');
          out[reply.outcome.index] = reply.outcome;
          ev.finished?.(reply.outcome);
        }
      }),
    );
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return units.map((u) => out[u.index]!);
}
