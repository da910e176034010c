// The CLI's edge: reading inputs, writing outputs, messages on stderr. Everything else is pure.
import { readFileSync, statSync, writeFileSync } from 'node:fs';
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

/**
 * Writes the requested output file (its folder must exist: nothing else is created); an error message on
 * failure. An output path that names one of the inputs is refused: a slip in `-o` must not overwrite a
 * design file.
 */
export function writeOutput(
  cwd: string,
  path: string,
  text: string,
  inputs: readonly string[],
): string | undefined {
  const target = resolve(cwd, path);
  if (inputs.some((i) => sameFile(resolve(cwd, i), target)))
    return `refusing to write ${path}: it is one of the inputs`;
  try {
    writeFileSync(target, text, 'utf8');
    return undefined;
  } catch (err) {
    return `cannot write ${path}: ${describeFsError(err)}`;
  }
}

/** Same path, or the same file reached through another name (a link). */
function sameFile(a: string, b: string): boolean {
  if (a === b) return true;
  try {
    const [x, y] = [statSync(a), statSync(b)];
    return x.dev === y.dev && x.ino === y.ino;
  } catch {
    return false;
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
