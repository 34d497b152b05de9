#!/usr/bin/env node
// Entry point of the `modvet` command: wires process streams to the CLI function.
import { run } from './program.js';

const color = process.stdout.isTTY === true && process.env.NO_COLOR === undefined;

// a reader that stops early (`modvet check | head`) closes the pipe: end quietly
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw e;
  });
}

run(process.argv.slice(2), {
  out: (s) => process.stdout.write(s),
  err: (s) => process.stderr.write(s),
  color,
  progress: process.stderr.isTTY === true,
  ...(process.stderr.columns !== undefined ? { columns: process.stderr.columns } : {}),
}).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    // an internal fault: say so plainly, without a stack trace unless asked for
    process.stderr.write(`modvet: internal error: ${e instanceof Error ? e.message : String(e)}\n`);
    if (process.env.MODVET_DEBUG) console.error(e);
    process.exitCode = 3;
  },
);
