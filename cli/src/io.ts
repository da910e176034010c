// The CLI's edge: reading inputs, writing outputs, messages on stderr. Everything else is pure.
import { closeSync, fstatSync, openSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describeFsError } from './discover';

export type ReadResult =
  { readonly ok: true; readonly text: string } | { readonly ok: false; readonly message: string };

/**
 * The largest input read, in bytes. A design is a few kilobytes; one megabyte holds hundreds of them, and
 * the analysis of a whole file is held in memory at once (about 300 bytes of results per byte of design
 * text), so a larger file would exhaust the memory of the process instead of being reported.
 */
export const MAX_INPUT_BYTES = 1024 * 1024;

/**
 * Reads a design file as the editor sees it: UTF-8, without a byte-order mark (positions count from 0).
 * A file larger than `maxBytes` is refused unread, with its size in the message.
 */
export function readText(path: string, maxBytes = MAX_INPUT_BYTES): ReadResult {
  let fd: number | undefined;
  try {
    fd = openSync(path, 'r');
    const size = fstatSync(fd).size;
    if (size > maxBytes)
      return {
        ok: false,
        message: `the file is ${megabytes(size)}, larger than the ${megabytes(maxBytes)} an input may have; split it into smaller files`,
      };
    const text = readFileSync(fd, 'utf8');
    return { ok: true, text: text.charCodeAt(0) === 0xfeff ? text.slice(1) : text };
  } catch (err) {
    return { ok: false, message: describeFsError(err) };
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

const megabytes = (bytes: number) => `${+(bytes / (1024 * 1024)).toFixed(1)} MB`;

/**
 * Writes the requested output file (its folder must exist: nothing else is created); an error message on
 * failure. An output path that names one of the inputs or the `--config` file is refused: a slip in `-o`
 * must not overwrite a file the user wrote.
 */
export function writeOutput(
  cwd: string,
  path: string,
  text: string,
  inputs: readonly string[],
  config?: string,
): string | undefined {
  const target = resolve(cwd, path);
  if (inputs.some((i) => sameFile(resolve(cwd, i), target)))
    return `refusing to write ${path}: it is one of the inputs`;
  if (config !== undefined && sameFile(resolve(cwd, config), target))
    return `refusing to write ${path}: it is the --config file`;
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
