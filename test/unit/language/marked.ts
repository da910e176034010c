// Test helper: a document with ⟦…⟧ around the ranges a test expects (markers removed before parsing).
import type { SourceRange } from '../../../shared/src/language/source';

export function marked(source: string): { text: string; ranges: SourceRange[] } {
  const ranges: SourceRange[] = [];
  const open: { line: number; character: number }[] = [];
  let text = '';
  let line = 0;
  let character = 0;
  for (const ch of source) {
    if (ch === '⟦') open.push({ line, character });
    else if (ch === '⟧') ranges.push({ start: open.pop()!, end: { line, character } });
    else {
      text += ch;
      if (ch === '\n') {
        line++;
        character = 0;
      } else character += ch.length;
    }
  }
  // By start; of two ranges that start together, the enclosing one first.
  ranges.sort(
    (a, b) =>
      a.start.line - b.start.line ||
      a.start.character - b.start.character ||
      b.end.line - a.end.line ||
      b.end.character - a.end.character,
  );
  return { text, ranges };
}

/** A design around some statement lines, so a test can focus on the lines. */
export const wrap = (body: string, name = 'd'): string => `design ${name}\n${body}\nend\n`;
