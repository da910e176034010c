// A whole file → its designs, each with models, corners and symbols, plus every diagnostic. Never throws:
// whatever the text, the result is a document and a list of diagnostics whose ranges lie inside it.
import { DiagnosticSink, quote } from './diagnostics';
import { evaluateDesign } from './evaluate';
import { lexLine, spanRange, tokenRange, type LexedLine, type Token } from './lexer';
import type { DesignSource, ParsedDocument } from './model';
import { parseStatement } from './parseStatement';
import { editDistance, STATEMENT_KEYWORDS } from './vocabulary';
import type { SourceRange } from './source';
import { splitLines } from '../text/lines';
import type { DesignSyntax, Statement } from './syntax';

/** `ed`, `edn`, `ned`: one edit away from `end`, or its letters swapped. */
const nearEnd = (w: string): boolean => editDistance(w, 'end') <= 1 || [...w].sort().join('') === 'den';

const isKeyword = (w: string): boolean => (STATEMENT_KEYWORDS as readonly string[]).includes(w);

interface OpenDesign {
  readonly keyword: Token;
  readonly nameToken?: Token;
  readonly name: string;
  readonly statements: Statement[];
  readonly tentative: Token[];
  readonly brokenMentions: Set<string>;
  lastToken: Token;
}

export function parseDocument(text: string): ParsedDocument {
  const sink = new DiagnosticSink();
  const { lines, offsets } = splitLines(text);
  const designs: DesignSource[] = [];
  const seenNames = new Map<string, Token>();
  let open: OpenDesign | undefined;
  /** After a line that should have opened a design but did not: skip to the next `end` or `design`. */
  let skipping = false;

  const offsetOf = (line: number, character: number): number => offsets[line]! + character;

  const close = (endToken: Token | undefined): void => {
    const d = open!;
    open = undefined;
    const last = endToken ?? d.lastToken;
    const range: SourceRange = spanRange(d.keyword, last);
    if (!endToken)
      sink.error(
        'syntax',
        `Design ${quote(d.name)} has no \`end\`.`,
        d.nameToken ? spanRange(d.keyword, d.nameToken) : tokenRange(d.keyword),
      );
    const syntax: DesignSyntax = {
      name: d.name,
      keyword: d.keyword,
      nameToken: d.nameToken,
      range,
      statements: d.statements,
      tentativeNames: d.tentative,
      brokenMentions: d.brokenMentions,
      closed: endToken !== undefined,
    };
    if (d.nameToken) {
      const first = seenNames.get(d.name);
      if (first)
        sink.error(
          'reference',
          `Design ${quote(d.name)} is already declared in this file.`,
          tokenRange(d.nameToken),
          [{ range: tokenRange(first), message: `first design ${quote(d.name)}` }],
        );
      else seenNames.set(d.name, d.nameToken);
    }
    const result = evaluateDesign(syntax, sink);
    designs.push({
      name: d.name,
      range,
      nameRange: d.nameToken ? tokenRange(d.nameToken) : tokenRange(d.keyword),
      text: text.slice(
        offsetOf(range.start.line, range.start.character),
        offsetOf(range.end.line, range.end.character),
      ),
      ...(result.nominal ? { nominal: result.nominal } : {}),
      corners: result.corners,
      symbols: result.symbols,
    });
  };

  const openDesign = (lexed: LexedLine): void => {
    const [keyword, nameToken, extra] = lexed.tokens as Token[];
    let name: Token | undefined;
    if (!nameToken) sink.error('syntax', 'Missing the design name after `design`.', tokenRange(keyword!));
    else if (nameToken.kind !== 'ident')
      sink.error('syntax', `Expected a design name, found ${quote(nameToken.text)}.`, tokenRange(nameToken));
    else {
      name = nameToken;
      if (extra)
        sink.error('syntax', `Unexpected ${quote(extra.text)} after the design name.`, tokenRange(extra));
    }
    open = {
      keyword: keyword!,
      nameToken: name,
      name: name?.text ?? '',
      statements: [],
      tentative: [],
      brokenMentions: new Set(),
      lastToken: name ?? keyword!,
    };
  };

  for (let i = 0; i < lines.length; i++) {
    const lexed = lexLine(lines[i]!, i);
    const first = lexed.tokens[0];
    if (!first) continue;
    const word = first.kind === 'ident' ? first.text : '';
    if (word === 'design') {
      if (open) close(undefined);
      skipping = false;
      openDesign(lexed);
      continue;
    }
    if (word === 'end') {
      const extra = lexed.tokens[1];
      if (extra) sink.error('syntax', `Unexpected ${quote(extra.text)} after \`end\`.`, tokenRange(extra));
      if (open) close(first);
      else if (skipping) skipping = false;
      else sink.error('syntax', '`end` without a `design` to close.', tokenRange(first));
      continue;
    }
    if (!open && word && editDistance(word, 'design') <= 2 && lexed.tokens[1]?.kind === 'ident') {
      // `desgin amp`: read the block as the design it was meant to be, so nothing inside is lost.
      sink.error('syntax', `Unknown word ${quote(word)}. Did you mean \`design\`?`, tokenRange(first));
      skipping = false;
      openDesign(lexed);
      continue;
    }
    if (open && lexed.tokens.length === 1 && word && word !== 'end' && nearEnd(word) && !isKeyword(word)) {
      // `ned` alone on a line: close the design as `end` would, rather than run on into the next one.
      sink.error('syntax', `Unknown statement ${quote(word)}. Did you mean \`end\`?`, tokenRange(first));
      close(first);
      continue;
    }
    if (!open) {
      if (!skipping)
        sink.error('syntax', `Expected \`design NAME\`, found ${quote(first.text)}.`, tokenRange(first));
      skipping = true;
      continue;
    }
    open.lastToken = lexed.tokens[lexed.tokens.length - 1]!;
    const statement = parseStatement(lexed, lines[i]!, sink);
    if (statement) open.statements.push(statement);
    else if (lexed.tokens[1]?.kind === 'ident') open.tentative.push(lexed.tokens[1]);
    if (!statement || statement.broken)
      for (const t of lexed.tokens) if (t.kind === 'ident') open.brokenMentions.add(t.text);
  }
  if (open) close(undefined);
  const diagnostics = [...sink.items].sort(
    (a, b) => a.range.start.line - b.range.start.line || a.range.start.character - b.range.start.character,
  );
  return { designs, diagnostics };
}
