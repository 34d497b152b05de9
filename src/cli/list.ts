/**
 * `modvet list [paths...]`: the claims of each file with their clauses, without checking.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { parseSource } from '../lang/parser.js';
import { renderDiagnostic } from '../lang/diagnostics.js';
import type { Claim } from '../lang/ast.js';
import { groupName } from '../groups/subgroups.js';
import { findClaimFiles } from './files.js';
import type { Streams } from './program.js';

function clauses(c: Claim, text: string): string[] {
  const src = (s: { start: number; end: number }) => text.slice(s.start, s.end).replace(/\s+/g, ' ').trim();
  const out: string[] = [];
  if (c.group !== undefined) out.push(`for ${c.group.variable} in ${groupName(c.group.group)}`);
  for (const p of c.params) out.push(src(p.span));
  if (c.at !== undefined) out.push(src(c.at.span));
  if (c.region !== undefined) out.push(src(c.region.span));
  if (c.digits !== undefined) out.push(`digits ${c.digits}`);
  if (c.samples !== undefined) out.push(`samples ${c.samples}`);
  if (c.expect !== 'holds') out.push(`expect ${c.expect}`);
  return out;
}

export function runList(paths: string[], io: Streams, cwd: string): number {
  const found = findClaimFiles(paths.length > 0 ? paths : ['identities'], cwd);
  let bad = found.problems.length;
  for (const p of found.problems) io.err(`modvet: ${p.file}: ${p.message}\n`);
  let count = 0;
  for (const file of found.files) {
    let text: string;
    try {
      text = readFileSync(resolve(cwd, file), 'utf8');
    } catch (e) {
      io.err(`modvet: ${file}: ${e instanceof Error ? e.message : String(e)}\n`);
      bad++;
      continue;
    }
    const { ast, diagnostics } = parseSource(text, file);
    for (const d of diagnostics) io.err(renderDiagnostic(d, text) + '\n');
    if (diagnostics.length > 0) bad++;
    io.out(`${file}\n`);
    for (const c of ast.claims) {
      count++;
      io.out(`  ${c.span.line}: ${c.name}\n`);
      for (const cl of clauses(c, text)) io.out(`      ${cl}\n`);
      io.out(`      ${c.text}\n`);
      if (c.source !== undefined) io.out(`      source: ${c.source}\n`);
    }
  }
  io.out(`${count} claims in ${found.files.length} files\n`);
  return bad > 0 ? 2 : 0;
}
