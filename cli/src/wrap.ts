// Long sentences for the terminal: broken between words into lines of a readable width.

/** `text` as lines of at most `width` characters (a longer single word stays whole), broken between words. */
export function wrapWords(text: string, width = 100): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    if (line && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) lines.push(line);
  return lines;
}
