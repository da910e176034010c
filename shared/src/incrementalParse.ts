// Parsing a long document piece by piece: the text is cut before every `design` line, each piece is parsed
// on its own and its result reused while its text is unchanged (shifted when lines were added above it).
// The language is line-based and every `design` line closes the design before it, so the pieces' results
// put together equal a parse of the whole text (a property the tests check on random documents). The one
// rule that spans pieces, a design name declared twice, is left to a whole-text parse whenever it applies.
import { parseDocument } from './language';
import { lexLine } from './language/lexer';
import type { ParsedDocument } from './language/model';
import { firstLine, lineStarts } from './text/lines';

export interface Piece {
  readonly text: string;
  /** Zero-based line of the piece's first line in the document. */
  readonly startLine: number;
}

const DESIGN_LINE = /[ \t]*design(?![A-Za-z0-9_\u00b5\u03bc\u03a9\u2126])/y;

/** Cut `text` before each line whose first token is `design` (lines as the parser counts them). */
export function splitAtDesigns(text: string): Piece[] {
  const pieces: Piece[] = [];
  const starts = lineStarts(text);
  let pieceStart = 0;
  let pieceLine = 0;
  for (let line = 1; line < starts.length; line++) {
    const at = starts[line]!;
    if (!opensDesign(text.slice(at, starts[line + 1] ?? text.length))) continue;
    pieces.push({ text: text.slice(pieceStart, at), startLine: pieceLine });
    pieceStart = at;
    pieceLine = line;
  }
  pieces.push({ text: text.slice(pieceStart), startLine: pieceLine });
  return pieces;
}

/** Whether `line` (a line with its line break) opens a design, as the parser reads it. */
function opensDesign(line: string): boolean {
  DESIGN_LINE.lastIndex = 0;
  if (!DESIGN_LINE.test(line)) return false;
  const first = lexLine(firstLine(line), 0).tokens[0];
  return first?.kind === 'ident' && first.text === 'design';
}

/** A deep copy of `value` with every position's line moved by `delta` (shared objects stay shared). */
export function shiftLines<T>(value: T, delta: number): T {
  return delta === 0 ? value : (shift(value, delta, new Map()) as T);
}

function shift(value: unknown, delta: number, memo: Map<object, unknown>): unknown {
  if (value === null || typeof value !== 'object') return value;
  if (Array.isArray(value)) {
    const out = new Array<unknown>(value.length);
    for (let i = 0; i < value.length; i++) out[i] = shift(value[i], delta, memo);
    return out;
  }
  const src = value as Record<string, unknown>;
  // Positions and ranges are the bulk of the data and never shared in a way that matters: copy directly.
  if (
    typeof src['line'] === 'number' &&
    typeof src['character'] === 'number' &&
    Object.keys(src).length === 2
  )
    return { line: (src['line'] as number) + delta, character: src['character'] };
  const start = src['start'] as Record<string, unknown> | undefined;
  const end = src['end'] as Record<string, unknown> | undefined;
  if (
    start &&
    end &&
    typeof start['line'] === 'number' &&
    typeof end['line'] === 'number' &&
    Object.keys(src).length === 2
  )
    return {
      start: { line: (start['line'] as number) + delta, character: start['character'] },
      end: { line: (end['line'] as number) + delta, character: end['character'] },
    };
  const seen = memo.get(src);
  if (seen) return seen;
  const out: Record<string, unknown> = {};
  memo.set(src, out);
  for (const key in src) out[key] = shift(src[key], delta, memo);
  return out;
}

export interface ParseCache {
  parse(text: string): ParsedDocument;
  clear(): void;
}

/** Piece-wise parsing with reuse; falls back to a whole-text parse when a design name repeats. */
type Entry = { startLine: number; parsed: ParsedDocument };

/** A piece is new when no piece of the previous text had its text. */
const MANY_NEW = 8;

/**
 * Piece-wise parsing with reuse; falls back to a whole-text parse when a design name repeats. When many
 * pieces are new (the first parse of a document), the whole text is parsed once and the result divided
 * among the pieces, which is cheaper than parsing each piece and moving it to its place.
 */
export function createParseCache(): ParseCache {
  let entries = new Map<string, Entry>();
  return {
    parse(text) {
      const pieces = splitAtDesigns(text);
      let fresh = 0;
      for (const piece of pieces) if (!entries.has(piece.text)) fresh++;
      if (fresh > MANY_NEW) {
        const whole = parseDocument(text);
        entries = divide(whole, pieces) ?? new Map();
        return whole;
      }
      const next = new Map<string, Entry>();
      const designs: ParsedDocument['designs'][number][] = [];
      const diagnostics: ParsedDocument['diagnostics'][number][] = [];
      for (const piece of pieces) {
        let entry = next.get(piece.text) ?? entries.get(piece.text);
        if (!entry)
          entry = {
            startLine: piece.startLine,
            parsed: shiftLines(parseDocument(piece.text), piece.startLine),
          };
        else if (entry.startLine !== piece.startLine)
          entry = {
            startLine: piece.startLine,
            parsed: shiftLines(entry.parsed, piece.startLine - entry.startLine),
          };
        next.set(piece.text, entry);
        designs.push(...entry.parsed.designs);
        diagnostics.push(...entry.parsed.diagnostics);
      }
      entries = next;
      if (hasRepeatedName(designs)) return parseDocument(text);
      return { designs, diagnostics };
    },
    clear: () => entries.clear(),
  };
}

function hasRepeatedName(designs: ParsedDocument['designs']): boolean {
  const names = new Set<string>();
  for (const d of designs) {
    if (d.name && names.has(d.name)) return true;
    names.add(d.name);
  }
  return false;
}

/**
 * A whole-text parse divided among its pieces by line: what each piece's own parse would give, since a
 * piece's designs and diagnostics all lie on its lines. Undefined when a name repeats (that diagnostic
 * belongs to no single piece) or two pieces share a text.
 */
function divide(whole: ParsedDocument, pieces: readonly Piece[]): Map<string, Entry> | undefined {
  if (hasRepeatedName(whole.designs)) return undefined;
  const out = new Map<string, Entry>();
  let d = 0;
  let g = 0;
  for (let i = 0; i < pieces.length; i++) {
    const piece = pieces[i]!;
    const end = pieces[i + 1]?.startLine ?? Infinity;
    const designs: ParsedDocument['designs'][number][] = [];
    const diagnostics: ParsedDocument['diagnostics'][number][] = [];
    while (d < whole.designs.length && whole.designs[d]!.range.start.line < end)
      designs.push(whole.designs[d++]!);
    while (g < whole.diagnostics.length && whole.diagnostics[g]!.range.start.line < end)
      diagnostics.push(whole.diagnostics[g++]!);
    if (out.has(piece.text)) return undefined;
    out.set(piece.text, { startLine: piece.startLine, parsed: { designs, diagnostics } });
  }
  return out;
}
