// Fuzzing the bundled server over stdio: documents built from the examples by random edits (and token soup),
// opened, edited and queried at random positions with every editor feature. Each answer is checked: no
// text a person would read holds NaN, Infinity, undefined or [object …], every range lies inside the
// document, every request answers within a bound, and the server neither exits nor logs a failure.
// Shared by the protocol test (a small run) and scripts/fuzzServer.mjs (a large run that prints figures).
import { readdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { LspClient, ROOT, waitFor } from './lspClient';
import { LANGUAGE_WORDS, OPERATORS } from '../fuzzWords';

/** A small seeded generator (mulberry32), so that a failing run can be repeated from its seed. */
export function prng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (n: number) => Math.floor(next() * n);
  return { next, int, pick: <T>(xs: readonly T[]): T => xs[int(xs.length)]! };
}
type Rng = ReturnType<typeof prng>;

const EXAMPLES = readdirSync(resolve(ROOT, 'examples'))
  .filter((f) => f.endsWith('.ampnote'))
  .sort()
  .map((f) => readFileSync(resolve(ROOT, 'examples', f), 'utf8'));

const TOKENS = [
  ...LANGUAGE_WORDS,
  ...OPERATORS,
  'first',
  'second',
  'third',
  'gm1',
  '0',
  '1',
  '2.2',
  '.5',
  '1e-12',
  '1e999',
  '1e-999',
  '1e30',
  '1e-30',
  '9e307',
  '5e-324',
  'pF',
  'fF',
  'uS',
  'mS',
  'Mohm',
  'kΩ',
  'µF',
  'V/us',
  'deg',
  '°',
  'dB',
  'MHz',
  '−',
  '×',
  '😀',
  '\t',
  '"',
  '\u00a0',
  '\u2028',
  'sqrt(',
  'max(',
  '\r',
  '\n',
  '\r\n',
];

/** A text made from an example by a few random edits, or (one time in eight) token soup. */
export function randomDocument(rng: Rng): string {
  if (rng.int(8) === 0) {
    const lines = Array.from({ length: 1 + rng.int(20) }, () =>
      Array.from({ length: rng.int(10) }, () => rng.pick(TOKENS)).join(' '),
    );
    return lines.join(rng.pick(['\n', '\r\n', '\r']));
  }
  let text = rng.pick(EXAMPLES);
  if (rng.int(4) === 0) text = text.replace(/\r?\n/g, rng.pick(['\r', '\r\n']));
  const edits = 1 + rng.int(5);
  for (let i = 0; i < edits; i++) text = mutate(rng, text);
  return text;
}

/** One random edit, as a user or an editor makes them. */
export function mutate(rng: Rng, text: string): string {
  const at = rng.int(text.length + 1);
  switch (rng.int(6)) {
    case 0:
      return text.slice(0, at) + text.slice(at + 1 + rng.int(12));
    case 1:
      return text.slice(0, at) + rng.pick(TOKENS) + text.slice(at);
    case 2:
      return text.slice(0, at) + ` ${rng.pick(TOKENS)} ${rng.pick(TOKENS)} ` + text.slice(at);
    case 3: {
      const lines = text.split('\n');
      const i = rng.int(lines.length);
      lines.splice(rng.int(lines.length), 0, lines[i]!);
      return lines.join('\n');
    }
    case 4: {
      // A number replaced by another of any size: where NaN and infinities come from.
      return text.replace(/\d+(\.\d+)?/, () =>
        rng.pick(['0', '1e999', '1e-999', '1e30', '9e307', '1e-30', '3']),
      );
    }
    default:
      return text.slice(0, at);
  }
}

export interface Figures {
  documents: number;
  requests: number;
  /** The server exited, or logged a failure of a feature handler. */
  crashes: number;
  /** A request or diagnostics that did not come within the bound. */
  hangs: number;
  badStrings: number;
  badRanges: number;
  slowestMs: number;
  slowest: string;
  /** The first few problems, each with the method and an excerpt of the input. */
  examples: string[];
}

/**
 * Words that only a formatting slip puts into text: a number that is not one, an infinity printed by
 * JavaScript, a missing value or an object turned into text. "is undefined" is English (a node voltage that
 * no equation fixes), not a missing value.
 */
const BAD_TEXT = /\bNaN\b|Infinity|(?<!\bis )\bundefined\b|\[object /;

/** Every string in `value` that a person would read and that holds a bad word. */
export function badStrings(value: unknown, out: string[] = []): string[] {
  if (typeof value === 'string') {
    if (BAD_TEXT.test(value)) out.push(value);
  } else if (Array.isArray(value)) for (const v of value) badStrings(v, out);
  else if (value && typeof value === 'object')
    for (const [k, v] of Object.entries(value)) {
      // URIs and the diagnostics' own data are not shown; the document's text may hold anything.
      if (k === 'uri' || k === 'href' || k === 'data') continue;
      badStrings(v, out);
    }
  return out;
}

type Pos = { line: number; character: number };
const isPos = (p: unknown): p is Pos =>
  !!p &&
  typeof p === 'object' &&
  typeof (p as Pos).line === 'number' &&
  typeof (p as Pos).character === 'number';

/** Every range or position in `value` that lies outside the text (line lengths as LSP counts lines). */
export function badRanges(value: unknown, lengths: readonly number[], out: string[] = []): string[] {
  const inside = (p: Pos) =>
    Number.isInteger(p.line) &&
    Number.isInteger(p.character) &&
    p.line >= 0 &&
    p.line < lengths.length &&
    p.character >= 0 &&
    p.character <= lengths[p.line]!;
  if (Array.isArray(value)) for (const v of value) badRanges(v, lengths, out);
  else if (value && typeof value === 'object') {
    const o = value as Record<string, unknown>;
    if (isPos(o.start) && isPos(o.end)) {
      const { start, end } = o as { start: Pos; end: Pos };
      if (!inside(start) || !inside(end)) out.push(JSON.stringify(o));
      else if (start.line > end.line || (start.line === end.line && start.character > end.character))
        out.push(`reversed ${JSON.stringify(o)}`);
    } else if (isPos(o.position) && !inside(o.position)) out.push(JSON.stringify(o.position));
    for (const [k, v] of Object.entries(o)) if (k !== 'data') badRanges(v, lengths, out);
  }
  return out;
}

const lineLengths = (text: string) => text.split(/\r\n|\r|\n/).map((l) => l.length);

function randomPosition(rng: Rng, lengths: readonly number[]): Pos {
  const line = rng.int(lengths.length);
  return { line, character: rng.int(lengths[line]! + 1) };
}

export interface FuzzOptions {
  readonly seed: number;
  readonly documents: number;
  /** Feature requests per document (after its diagnostics). */
  readonly requestsPerDocument: number;
  /** A request or a document's diagnostics slower than this counts as a hang. */
  readonly boundMs: number;
  /** Called after each document, e.g. to show progress. */
  readonly onDocument?: (done: number, figures: Figures) => void;
}

/** Run the fuzz against a server started for it; the server is stopped afterwards. */
export async function fuzzServer(options: FuzzOptions): Promise<Figures> {
  const rng = prng(options.seed);
  const figures: Figures = {
    documents: 0,
    requests: 0,
    crashes: 0,
    hangs: 0,
    badStrings: 0,
    badRanges: 0,
    slowestMs: 0,
    slowest: '',
    examples: [],
  };
  const note = (what: string) => {
    if (figures.examples.length < 12) figures.examples.push(what.slice(0, 600));
  };
  let { client } = await LspClient.start();
  let logged = 0;
  const failuresLogged = () => {
    // Feature handlers log a failure as `[feature] <stack>`; the fuzz's own refusals are not failures.
    const fresh = client.logs.slice(logged).filter((l) => /^\[\w+\] \w*Error\b/m.test(l));
    logged = client.logs.length;
    return fresh;
  };

  const timed = async <R>(method: string, params: unknown, text: string): Promise<R | undefined> => {
    figures.requests++;
    const t0 = performance.now();
    let timer: NodeJS.Timeout | undefined;
    const bound = new Promise<'hang'>((r) => (timer = setTimeout(() => r('hang'), options.boundMs)));
    try {
      const answer = await Promise.race([client.request<R>(method, params), bound]);
      const ms = performance.now() - t0;
      if (ms > figures.slowestMs) [figures.slowestMs, figures.slowest] = [ms, method];
      if (answer === 'hang') {
        figures.hangs++;
        note(`hang: ${method} on ${JSON.stringify(text.slice(0, 300))}`);
        return undefined;
      }
      return answer;
    } catch (error) {
      // A deliberate refusal (a ResponseError) is an answer; only the server going away is a crash.
      if (client.exited) return undefined;
      void error;
      return undefined;
    } finally {
      clearTimeout(timer);
    }
  };

  const check = (method: string, answer: unknown, text: string) => {
    const strings = badStrings(answer);
    if (strings.length) {
      figures.badStrings += strings.length;
      note(
        `bad string from ${method}: ${JSON.stringify(strings[0])} on ${JSON.stringify(text.slice(0, 300))}`,
      );
    }
    const ranges = badRanges(answer, lineLengths(text));
    if (ranges.length) {
      figures.badRanges += ranges.length;
      note(`bad range from ${method}: ${ranges[0]} on ${JSON.stringify(text.slice(0, 300))}`);
    }
  };

  for (let d = 0; d < options.documents; d++) {
    const uri = `file:///fuzz/doc${d}.ampnote`;
    let text = randomDocument(rng);
    figures.documents++;
    client.open(uri, text);
    let version = 1;
    // A few documents are edited again before they are queried: the server must follow.
    for (let e = rng.int(3); e > 0; e--) version = client.change(uri, (text = mutate(rng, text)));
    const t0 = performance.now();
    const diagnostics = await waitFor(
      () => client.published.get(uri)?.find((p) => p.version === version)?.diagnostics,
      options.boundMs,
      'diagnostics',
    ).catch(() => undefined);
    figures.requests++;
    if (!diagnostics) {
      if (!client.exited) {
        figures.hangs++;
        note(`hang: diagnostics on ${JSON.stringify(text.slice(0, 300))}`);
      }
    } else {
      const ms = performance.now() - t0;
      if (ms > figures.slowestMs) [figures.slowestMs, figures.slowest] = [ms, 'diagnostics'];
      check('diagnostics', diagnostics, text);
    }
    const lengths = lineLengths(text);
    for (let r = 0; r < options.requestsPerDocument && !client.exited; r++) {
      const position = randomPosition(rng, lengths);
      const other = randomPosition(rng, lengths);
      const range =
        other.line < position.line || (other.line === position.line && other.character < position.character)
          ? { start: other, end: position }
          : { start: position, end: other };
      // Code actions over a few lines, as an editor asks for them at the cursor.
      const near = { start: position, end: { line: position.line, character: lengths[position.line]! } };
      const textDocument = { uri };
      const [method, params] = rng.pick([
        ['textDocument/hover', { textDocument, position }],
        ['textDocument/inlayHint', { textDocument, range }],
        [
          'textDocument/codeAction',
          { textDocument, range: near, context: { diagnostics: diagnostics ?? [] } },
        ],
        ['textDocument/codeLens', { textDocument }],
        ['textDocument/completion', { textDocument, position }],
        ['textDocument/documentSymbol', { textDocument }],
        ['textDocument/definition', { textDocument, position }],
        ['textDocument/prepareRename', { textDocument, position }],
      ] as const);
      check(method, await timed(method, params, text), text);
    }
    const failures = failuresLogged();
    if (failures.length) {
      figures.crashes += failures.length;
      note(`failure logged: ${failures[0]} on ${JSON.stringify(text.slice(0, 300))}`);
    }
    if (client.exited) {
      figures.crashes++;
      note(`server exited on ${JSON.stringify(text.slice(0, 300))}`);
      ({ client } = await LspClient.start());
      logged = 0;
    } else client.close(uri);
    options.onDocument?.(d + 1, figures);
  }
  await client.stop();
  return figures;
}
