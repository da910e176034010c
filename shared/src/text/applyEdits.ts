// Text edits (LSP-style positions) applied to a whole text: what `ampnote solve --write` writes and what a
// test applies, counted with the one line splitter.
import type { TextEditSpec } from '../checks/types';
import type { SourcePosition } from '../language/source';
import { lineStarts } from './lines';

/** `text` with `edits` applied; undefined when an edit lies outside the text or edits overlap. */
export function applyEdits(text: string, edits: readonly TextEditSpec[]): string | undefined {
  const starts = lineStarts(text);
  const offset = (p: SourcePosition): number | undefined => {
    const start = starts[p.line];
    if (start === undefined) return undefined;
    const at = start + p.character;
    return at <= text.length ? at : undefined;
  };
  const located = edits.map((e) => ({
    from: offset(e.range.start),
    to: offset(e.range.end),
    text: e.newText,
  }));
  if (located.some((e) => e.from === undefined || e.to === undefined || e.to < e.from)) return undefined;
  const sorted = [...located].sort((a, b) => b.from! - a.from!);
  for (let i = 1; i < sorted.length; i++) if (sorted[i]!.to! > sorted[i - 1]!.from!) return undefined;
  let out = text;
  for (const e of sorted) out = out.slice(0, e.from) + e.text + out.slice(e.to);
  return out;
}
