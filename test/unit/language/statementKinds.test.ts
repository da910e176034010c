// The statement kinds' descriptors are the one definition of each kind: the tables derived from them, the
// editor grammar and completion must agree with them.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import * as oniguruma from 'vscode-oniguruma';
import { INITIAL, Registry, parseRawGrammar, type IGrammar } from 'vscode-textmate';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { completion } from '../../../server/src/features/completion';
import { FUNCTION_NAMES, parseDocument, STATEMENT_KEYWORDS } from '../../../shared/src/language';
import { STATEMENT_KINDS } from '../../../shared/src/language/statements';
import { CONNECTORS, FIELD_DIMENSIONS, FLAGS_BY_STATEMENT } from '../../../shared/src/language/vocabulary';
import { analyzeDocument } from '../../../shared/src/service';

const root = join(__dirname, '../../..');
const descriptors = Object.entries(STATEMENT_KINDS);

describe('statement descriptors', () => {
  it('list the statements in the order the language gives them', () => {
    expect(STATEMENT_KEYWORDS).toEqual(descriptors.map(([k]) => k));
    const doc = readFileSync(join(root, 'docs/language.md'), 'utf8');
    const grammarLine = /^statement\s+=([\s\S]*?);/m.exec(doc)![1]!;
    expect(grammarLine.split('|').map((w) => w.trim())).toEqual(STATEMENT_KEYWORDS);
  });

  it('give a field name one unit in every statement that has it', () => {
    for (const [kind, d] of descriptors)
      for (const f of d.fields) expect(FIELD_DIMENSIONS[f.name], `${kind}.${f.name}`).toBe(f.unit);
  });

  it('tell the connection check how each node is used', () => {
    // `a` is only sensed (the gm's control), `b` is attached: only `a` draws the "only sensed" warning.
    const text = `design d
  node a, b
  element gm a -> b = 1 mS
  element res b gnd = 1 kohm
  output b
end`;
    const messages = parseDocument(text).diagnostics.map((x) => x.message);
    expect(messages).toEqual([
      'Nothing connects to node `a`: it is only sensed, so its voltage is undefined.',
    ]);
  });
});

describe('the editor grammar', () => {
  let grammar: IGrammar;
  beforeAll(async () => {
    const wasm = readFileSync(join(root, 'node_modules/vscode-oniguruma/release/onig.wasm'));
    await oniguruma.loadWASM(
      wasm.buffer.slice(wasm.byteOffset, wasm.byteOffset + wasm.byteLength) as ArrayBuffer,
    );
    const registry = new Registry({
      onigLib: Promise.resolve({
        createOnigScanner: (patterns: string[]) => new oniguruma.OnigScanner(patterns),
        createOnigString: (s: string) => new oniguruma.OnigString(s),
      }),
      loadGrammar: async () => {
        const path = join(root, 'syntaxes/ampnote.tmLanguage.json');
        return parseRawGrammar(readFileSync(path, 'utf8'), path);
      },
    });
    grammar = (await registry.loadGrammar('source.ampnote'))!;
  });

  /** The scopes of the first token of `word` in `line`. */
  const scopesAt = (line: string, word: string): string[] => {
    const at = line.indexOf(word);
    return grammar.tokenizeLine(line, INITIAL).tokens.find((t) => t.startIndex <= at && at < t.endIndex)!
      .scopes;
  };

  it('colours every statement keyword the descriptors define', () => {
    for (const [k, d] of descriptors)
      expect(scopesAt(`  ${k} ${d.variants?.words[0] ?? 'x'}`, k), k).toContain(
        'keyword.other.statement.ampnote',
      );
  });

  it('colours every variant, connector, flag and field the descriptors define', () => {
    for (const w of STATEMENT_KINDS.element.variants!.words)
      expect(scopesAt(`  element ${w} a b = 1`, w), w).toContain('storage.type.element.ampnote');
    for (const w of STATEMENT_KINDS.require.variants!.words)
      expect(scopesAt(`  require ${w} >= 1`, w), w).toContain('support.constant.requirement.ampnote');
    for (const w of CONNECTORS)
      expect(scopesAt(`  x y ${w} z`, w), w).toContain('keyword.other.connector.ampnote');
    for (const w of new Set(Object.values(FLAGS_BY_STATEMENT).flat()))
      expect(scopesAt(`  x y ${w}`, w), w).toContain('storage.modifier.polarity.ampnote');
    for (const w of Object.keys(FIELD_DIMENSIONS))
      expect(scopesAt(`  x y ${w} = 1`, w), w).toContain('variable.parameter.field.ampnote');
  });
});

describe('completion from the descriptors', () => {
  const labels = (marked: string): string[] => {
    const at = marked.indexOf('|');
    const text = marked.slice(0, at) + marked.slice(at + 1);
    const lines = text.slice(0, at).split('\n');
    const position = { line: lines.length - 1, character: lines[lines.length - 1]!.length };
    const document = TextDocument.create('file:///t.ampnote', 'ampnote', 1, text);
    return completion(analyzeDocument(text), document, position).map((i) => i.label);
  };
  const inDesign = (line: string): string =>
    `design d\n  param gm1 = 1 mS\n  stage first gm = gm1 rout = 1 Mohm\n${line}\nend\n`;

  it('offers the variants a keyword takes', () => {
    expect(labels(inDesign('  element |'))).toEqual(['res', 'cap', 'gm']);
    expect(labels(inDesign('  require |'))).toEqual(expect.arrayContaining(['zero', 'settle', 'dcgain']));
  });

  it('offers the functions where a value can start', () => {
    for (const line of [
      '  stage s gm = |',
      '  stage s gm = sq|',
      '  param x = 2 * |',
      '  param x = max(1 pF, |',
      '  param x = (|',
      '  require pm >= |',
      '  require settle |',
      '  corner slow gm1 = |',
    ])
      expect(labels(inDesign(line)), line).toEqual(expect.arrayContaining([...FUNCTION_NAMES]));
  });

  it('does not offer them where no value can start', () => {
    for (const line of [
      '  stage s |',
      '  stage s gm = gm1 |',
      '  corner slow gm1 = 2 mS, |',
      '  node a, |',
      '  miller first -> |',
    ])
      expect(labels(inDesign(line)), line).not.toContain('sqrt');
  });

  it('answers for a word that is no statement, whatever it is', () => {
    expect(() => labels(inDesign('  constructor |'))).not.toThrow();
    expect(() => labels(inDesign('  stage s toString = 1 |'))).not.toThrow();
  });
});
