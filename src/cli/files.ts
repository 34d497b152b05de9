/**
 * Finding claim files: the paths given (files, or folders searched recursively for *.vet),
 * in a stable order (sorted), each once.
 */
import { readdirSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';

export interface Found {
  files: string[];
  /** Paths that do not exist or cannot be read, with the reason. */
  problems: { file: string; message: string }[];
}

function walk(dir: string, out: string[]): void {
  const entries = readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  for (const e of entries) {
    const p = join(dir, e.name);
    if (e.isDirectory()) {
      if (e.name === 'node_modules' || e.name.startsWith('.')) continue;
      walk(p, out);
    } else if (e.isFile() && e.name.endsWith('.vet')) {
      out.push(p);
    }
  }
}

/** Claim files under the given paths; paths are shown relative to cwd when inside it. */
export function findClaimFiles(paths: string[], cwd: string): Found {
  const files: string[] = [];
  const problems: { file: string; message: string }[] = [];
  const seen = new Set<string>();
  const show = (p: string) => {
    const r = relative(cwd, resolve(cwd, p));
    return r.startsWith('..') ? resolve(cwd, p) : r;
  };
  for (const p of paths) {
    const abs = resolve(cwd, p);
    let isDir: boolean;
    try {
      isDir = statSync(abs).isDirectory();
    } catch {
      problems.push({ file: p, message: 'no such file or folder' });
      continue;
    }
    const found: string[] = [];
    try {
      if (isDir) walk(abs, found);
      else found.push(abs);
    } catch (e) {
      problems.push({ file: p, message: e instanceof Error ? e.message : String(e) });
      continue;
    }
    for (const f of found) {
      const key = resolve(f);
      if (seen.has(key)) continue;
      seen.add(key);
      files.push(show(f));
    }
  }
  return { files, problems };
}
