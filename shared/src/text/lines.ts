// The one definition of a line in this code base. A line ends at \r\n, a lone \n or a lone \r, as in the
// Language Server Protocol and the editor: every position (line, UTF-16 character) that the parser makes
// and every position an adapter computes must count lines the same way, or a value lands on the wrong
// line or past its end.

/** Whether the UTF-16 code unit `c` ends a line (\n or \r). */
export const isLineBreak = (c: number): boolean => c === 10 || c === 13;

/** Offsets of each line's first character in `text`; always at least one line (an empty text has one). */
export function lineStarts(text: string): number[] {
  const starts = [0];
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 13 && text.charCodeAt(i + 1) === 10) i++;
    if (isLineBreak(c)) starts.push(i + 1);
  }
  return starts;
}

/** The lines of `text` without their line breaks, and each line's start offset. */
export function splitLines(text: string): { lines: string[]; offsets: number[] } {
  const offsets = lineStarts(text);
  const lines = offsets.map((start, i) => {
    const next = offsets[i + 1];
    return text.slice(start, next === undefined ? text.length : next - breakLengthBefore(text, next));
  });
  return { lines, offsets };
}

/** How many code units the line break that ends just before `next` takes (2 for \r\n, else 1). */
function breakLengthBefore(text: string, next: number): number {
  return text.charCodeAt(next - 1) === 10 && text.charCodeAt(next - 2) === 13 ? 2 : 1;
}

/** `text` up to its first line break: what a slice that starts at a line's beginning holds of that line. */
export function firstLine(text: string): string {
  for (let i = 0; i < text.length; i++) if (isLineBreak(text.charCodeAt(i))) return text.slice(0, i);
  return text;
}
