// One line inside a design → one statement. A syntax error stops that statement only: it is reported once,
// the statement is marked broken, and the next line starts afresh. What each kind reads after its keyword is
// its descriptor's (statements/).
import { closest } from './closestWord';
import { quote, type DiagnosticSink } from './diagnostics';
import { spanRange, tokenEnd, tokenRange, type LexedLine } from './lexer';
import { StatementParser, Stop } from './statementParser';
import { STATEMENT_KINDS, type Statement, type StatementKind } from './statements';
import {
  CONNECTORS,
  FIELDS_BY_STATEMENT,
  FLAGS_BY_STATEMENT,
  OTHER_KEYWORDS,
  STATEMENT_KEYWORDS,
} from './vocabulary';

// Words that may follow a value on the same line; any other word right after a number is read as its unit.
const STOP_WORDS: ReadonlySet<string> = new Set([
  ...Object.values(FIELDS_BY_STATEMENT).flat(),
  ...Object.values(FLAGS_BY_STATEMENT).flat(),
  ...CONNECTORS,
]);
/** Words that cannot name a parameter, stage, node or corner. */
// Field names (`cc`, `gm`) and element and requirement words stay usable as names: where they appear
// decides what they mean (`param cc = 1 pF` … `cc = cc`).
export const RESERVED_NAMES: ReadonlySet<string> = new Set([
  ...OTHER_KEYWORDS,
  ...STATEMENT_KEYWORDS,
  'ugf',
  'in',
  'gnd',
]);

const isStatementKeyword = (word: string): word is StatementKind =>
  (STATEMENT_KEYWORDS as readonly string[]).includes(word);

/** Parses one non-empty line inside a design. Returns `undefined` for an unknown statement (reported). */
export function parseStatement(line: LexedLine, text: string, sink: DiagnosticSink): Statement | undefined {
  const keyword = line.tokens[0]!;
  if (keyword.kind !== 'ident' || !isStatementKeyword(keyword.text)) {
    const near = keyword.kind === 'ident' ? closest(keyword.text, STATEMENT_KEYWORDS) : undefined;
    sink.error(
      'syntax',
      `Unknown statement ${quote(keyword.text)}.${near ? ` Did you mean ${quote(near)}?` : ''} A design holds: ${STATEMENT_KEYWORDS.join(', ')}; it closes with \`end\`.`,
      tokenRange(keyword),
    );
    return undefined;
  }
  const kind = keyword.text;
  const descriptor = STATEMENT_KINDS[kind];
  const words = { fields: FIELDS_BY_STATEMENT[kind]!, flags: FLAGS_BY_STATEMENT[kind]! };
  const p = new StatementParser(line, text, sink, keyword, words, STOP_WORDS);
  const parts: Record<string, unknown> = {};
  try {
    // The descriptor was picked by this keyword, so `parts` becomes that kind's own parts.
    (descriptor.parse as (p: StatementParser, parts: Record<string, unknown>) => void)(p, parts);
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
  }
  const lastToken = line.tokens[line.tokens.length - 1]!;
  return {
    kind,
    ...parts,
    ...(p.polarity ? { polarity: p.polarity } : {}),
    keyword,
    range: spanRange(keyword, lastToken),
    insertAt: tokenEnd(lastToken),
    fields: p.fields,
    broken: p.broken,
  } as Statement;
}
