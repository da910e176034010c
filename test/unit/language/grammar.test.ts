// The editor grammar, run by the same TextMate engine and regular-expression library the editor uses.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import * as oniguruma from 'vscode-oniguruma';
import { INITIAL, Registry, parseRawGrammar, type IGrammar } from 'vscode-textmate';
import { FUNCTION_NAMES } from '../../../shared/src/language/expressionFunctions';

const root = join(__dirname, '../../..');
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
    loadGrammar: async (scope) => {
      if (scope !== 'source.ampnote') return null;
      const path = join(root, 'syntaxes/ampnote.tmLanguage.json');
      return parseRawGrammar(readFileSync(path, 'utf8'), path);
    },
  });
  grammar = (await registry.loadGrammar('source.ampnote'))!;
});

/** The scopes of the token covering `needle` (its first occurrence) in `line`. */
function scopesAt(line: string, needle: string): string[] {
  const at = line.indexOf(needle);
  const { tokens } = grammar.tokenizeLine(line, INITIAL);
  const t = tokens.find((tok) => tok.startIndex <= at && at < tok.endIndex)!;
  return t.scopes;
}

describe('TextMate grammar', () => {
  it('loads', () => {
    expect(grammar).toBeDefined();
  });

  it('colours keywords, names, numbers, units and comments', () => {
    const line = '  stage second from first gm = 2.2 mS rout = 120 kohm inverting  # note';
    expect(scopesAt(line, 'stage')).toContain('keyword.other.statement.ampnote');
    expect(scopesAt(line, 'second')).toContain('entity.name.function.stage.ampnote');
    expect(scopesAt(line, 'from')).toContain('keyword.other.connector.ampnote');
    expect(scopesAt(line, 'gm')).toContain('variable.parameter.field.ampnote');
    expect(scopesAt(line, '2.2')).toContain('constant.numeric.ampnote');
    expect(scopesAt(line, 'mS')).toContain('keyword.other.unit.ampnote');
    expect(scopesAt(line, 'kohm')).toContain('keyword.other.unit.ampnote');
    expect(scopesAt(line, 'inverting')).toContain('storage.modifier.polarity.ampnote');
    expect(scopesAt(line, '# note')).toContain('comment.line.number-sign.ampnote');
  });

  it('colours design blocks, element kinds, requirements and built-in nodes', () => {
    expect(scopesAt('design pd_frontend', 'pd_frontend')).toContain('entity.name.type.design.ampnote');
    expect(scopesAt('end', 'end')).toContain('keyword.control.end.ampnote');
    expect(scopesAt('  element cap a gnd = 25 fF', 'cap')).toContain('storage.type.element.ampnote');
    expect(scopesAt('  element cap a gnd = 25 fF', 'gnd')).toContain('constant.language.node.ampnote');
    expect(scopesAt('  require slew >= 6 V/us', 'slew')).toContain('support.constant.requirement.ampnote');
    expect(scopesAt('  require slew >= 6 V/us', 'V/us')).toContain('keyword.other.unit.ampnote');
    expect(scopesAt('  require pm >= 60 deg', '>=')).toContain('keyword.operator.ampnote');
  });

  it('does not read a unit into a name that merely starts like one', () => {
    // `2 * gm1`: gm1 is a name, not a number's unit.
    expect(scopesAt('  param x = 2 * gm1', 'gm1')).not.toContain('keyword.other.unit.ampnote');
    expect(scopesAt('  param x = 3 pFoo', 'pFoo')).not.toContain('keyword.other.unit.ampnote');
  });

  it('colours units with powers and reciprocal units as one unit', () => {
    const line = '  param kp = 50 uA/V^2 # note';
    expect(scopesAt(line, 'uA/V^2')).toContain('keyword.other.unit.ampnote');
    expect(scopesAt(line, '^2')).toContain('keyword.other.unit.ampnote');
    expect(scopesAt('  param l = 0.04 /V', '/V')).toContain('keyword.other.unit.ampnote');
    expect(scopesAt('  param l = 0.04 V^-1', 'V^-1')).toContain('keyword.other.unit.ampnote');
    expect(scopesAt('  param c = 4 pF/V', 'pF/V')).toContain('keyword.other.unit.ampnote');
    // a spaced slash divides by a name
    expect(scopesAt('  param x = 2 / k', 'k')).not.toContain('keyword.other.unit.ampnote');
  });

  it('colours the parallel operator and every function the language has', () => {
    const line = '  stage s gm = sqrt(2 * kp * id) rout = ro_n || ro_p';
    expect(scopesAt(line, '||')).toContain('keyword.operator.ampnote');
    expect(scopesAt('  param r = a ∥ b', '∥')).toContain('keyword.operator.ampnote');
    for (const fn of FUNCTION_NAMES)
      expect(scopesAt(`  param x = ${fn}(1, 2)`, fn), fn).toContain('support.function.ampnote');
    // a parameter that happens to share a function's name is a name where it is not called
    expect(scopesAt('  param x = 2 * min', 'min')).not.toContain('support.function.ampnote');
  });

  it('tokenises a 100 000-digit number as one number', () => {
    const digits = '7'.repeat(100_000);
    const { tokens } = grammar.tokenizeLine(`  param x = ${digits} pF`, INITIAL);
    const numeric = tokens.filter((t) => t.scopes.includes('constant.numeric.ampnote'));
    expect(numeric).toHaveLength(1);
    expect(numeric[0]!.endIndex - numeric[0]!.startIndex).toBe(100_000);
  }, 30_000);
});
