/**
 * `modvet check --watch`: check once, then re-check a claim file's claims whenever it
 * changes (and pick up new files under the given folders), until interrupted (Ctrl-C).
 *
 * Changes are noticed with fs.watch on every claim file and folder, and settled for
 * SETTLE_MS (editors write a file in several steps) before the changed files are checked
 * again, each as a run of its own with its own summary line. A file that disappears is
 * dropped from the watch. Nothing is written except the reports asked for; --fix is refused
 * here, since the file it writes would itself be a change to watch.
 */
import { statSync, watch, type FSWatcher } from 'node:fs';
import { resolve } from 'node:path';
import { runCheck, type CheckFlags } from './check.js';
import { findClaimFiles } from './files.js';
import { UsageError } from './options.js';
import type { Streams } from './program.js';

export const SETTLE_MS = 250;

export interface WatchControl {
  /** Resolves to stop watching (tests); without it the watch runs until the process ends. */
  stop?: Promise<void>;
}

export async function runWatch(paths: string[], flags: CheckFlags, io: Streams, cwd: string, ctl: WatchControl = {}): Promise<number> {
  if (flags.fix === true) throw new UsageError('--watch cannot be combined with --fix (the file it writes would be a change to watch)');
  const roots = paths.length > 0 ? paths : ['identities'];
  let code = await runCheck(roots, flags, io, cwd);
  const watchers = new Map<string, FSWatcher>();
  const pending = new Set<string>();
  let timer: NodeJS.Timeout | null = null;
  let busy: Promise<void> = Promise.resolve();

  const files = (): string[] => findClaimFiles(roots, cwd).files;
  const arm = (p: string): void => {
    const abs = resolve(cwd, p);
    if (watchers.has(abs)) return;
    try {
      const w = watch(abs, () => changed(p));
      w.on('error', () => {
        w.close();
        watchers.delete(abs);
      });
      watchers.set(abs, w);
    } catch {
      // vanished between listing and watching: the next listing tells
    }
  };
  const changed = (p: string): void => {
    pending.add(p);
    if (timer !== null) clearTimeout(timer);
    timer = setTimeout(() => {
      timer = null;
      busy = busy.then(recheck);
    }, SETTLE_MS);
  };
  const recheck = async (): Promise<void> => {
    pending.clear();
    // a folder event may mean a new file; a file event, that file changed
    const now = files();
    const known = new Set([...watchers.keys()]);
    const fresh = now.filter((f) => !known.has(resolve(cwd, f)));
    const touched = now.filter((f) => {
      try {
        return statSync(resolve(cwd, f)).mtimeMs > lastRun || fresh.includes(f);
      } catch {
        return false;
      }
    });
    for (const f of fresh) arm(f);
    lastRun = Date.now();
    if (touched.length === 0) return;
    io.err(`modvet: ${touched.join(', ')} changed: checking again\n`);
    code = await runCheck(touched, flags, io, cwd);
  };

  let lastRun = Date.now();
  for (const r of roots) arm(r);
  for (const f of files()) arm(f);
  io.err('modvet: watching for changes (Ctrl-C to stop)\n');
  await (ctl.stop ?? new Promise<void>(() => {}));
  if (timer !== null) clearTimeout(timer);
  await busy;
  for (const w of watchers.values()) w.close();
  return code;
}
