/**
 * The worker thread of pool.ts: checks the units it is sent (unit.ts runUnit) and posts the
 * outcomes back. An internal fault is posted as a message, not thrown, so the main thread
 * can report it and stop the other workers.
 */
import { parentPort } from 'node:worker_threads';
import { runUnit, type Unit, type UnitSettings } from './unit.js';

parentPort?.on('message', (m: { unit: Unit; settings: UnitSettings }) => {
  try {
    parentPort!.postMessage({ outcome: runUnit(m.unit, m.settings) });
  } catch (e) {
    parentPort!.postMessage({ error: e instanceof Error ? `${e.message}\n${e.stack ?? ''}` : String(e) });
  }
});
