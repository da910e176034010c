// The CLI's edge: reading inputs, writing outputs, messages on stderr. Everything else is pure.
import { readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describeFsError } from './discover';

export type ReadResult =
  { readonly ok: true; readonly text: string } | { readonly ok: false; readonly message: string };

/** Reads a design file as the editor sees it: UTF-8, without a byte-order mark (positions count from 0). */
export function readText(path: string): ReadResult {
  try {
    const text = readFileSync(path, 'utf8');
    return { ok: true, text: text.charCodeAt(0) === 0xfeff ? text.slice(1) : text };
  } catch (err) {
    return { ok: false, message: describeFsError(err) };
  }
}

/** Writes the requested output file (its folder must exist: nothing else is created); an error message on failure. */
export function writeOutput(cwd: string, path: string, text: string): string | undefined {
  try {
    writeFileSync(resolve(cwd, path), text, 'utf8');
    return undefined;
  } catch (err) {
    return `cannot write ${path}: ${describeFsError(err)}`;
  }
}

export interface Streams {
  readonly stdout: NodeJS.WritableStream & { isTTY?: boolean };
  readonly stderr: NodeJS.WritableStream & { isTTY?: boolean; columns?: number };
}

/** One line on stderr, prefixed with the program's name when it is about no particular file. */
export function warn(streams: Streams, message: string): void {
  streams.stderr.write(`${message}\n`);
}
