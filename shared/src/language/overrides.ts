// A corner's overrides, sorted by what they replace; targets that do not exist are reported here.
import { quote } from './diagnostics';
import type { DesignScope, StatementOf } from './designScope';
import { tokenRange } from './lexer';
import type { OverrideSyntax, Statement, StatementKind } from './syntax';
import { closest } from './closestWord';
import { FIELDS_BY_STATEMENT, OVERRIDDEN_BY_KEYWORD } from './vocabulary';

/** Overrides of one corner, sorted by what they replace. */
export interface Overrides {
  readonly params: ReadonlyMap<string, OverrideSyntax>;
  /** Keyed by statement, then field name. */
  readonly fields: ReadonlyMap<Statement, ReadonlyMap<string, OverrideSyntax>>;
}

export const NO_OVERRIDES: Overrides = { params: new Map(), fields: new Map() };

const isOverriddenByKeyword = (name: string): name is StatementKind =>
  (OVERRIDDEN_BY_KEYWORD as readonly string[]).includes(name);

const quotedTargets = OVERRIDDEN_BY_KEYWORD.map(quote);
/** `` `load`, `miller`, … and `feedback` `` for messages. */
const KEYWORD_TARGETS = `${quotedTargets.slice(0, -1).join(', ')} and ${quotedTargets[quotedTargets.length - 1]}`;

/** Sorts a corner's overrides by target; reports targets that do not exist. */
export function collectOverrides(
  scope: DesignScope,
  corner: StatementOf<'corner'>,
): { overrides: Overrides; ok: boolean } {
  const params = new Map<string, OverrideSyntax>();
  const fields = new Map<Statement, Map<string, OverrideSyntax>>();
  const sink = scope.sink;
  let ok = true;
  // `load.cap` means the load at the output; the other kinds mean the design's only statement of that kind.
  // Either way exactly one statement must qualify: overriding the first of several would silently leave the
  // others at their nominal values.
  const unique = (kind: StatementKind, o: OverrideSyntax): Statement | undefined => {
    const all = scope.design.statements.filter((s) => s.kind === kind && !scope.skipped.has(s));
    const output = scope.outputName();
    const atOutput =
      kind === 'load' ? all.filter((s) => s.kind === 'load' && (!s.at || s.at.text === output)) : [];
    const candidates = atOutput.length ? atOutput : all;
    if (candidates.length === 1) return candidates[0];
    const where = atOutput.length ? ' at the output' : '';
    sink.error(
      'reference',
      candidates.length === 0
        ? `There is no \`${kind}\` statement for ${quote(o.targetText)} to override.`
        : `There are ${candidates.length} \`${kind}\` statements${where}, so ${quote(o.targetText)} is ambiguous: put the value in a \`param\` and override that.`,
      o.targetRange,
      candidates.map((s) => ({ range: tokenRange(s.keyword), message: `a \`${kind}\` statement${where}` })),
    );
    return undefined;
  };
  for (const o of corner.overrides) {
    const name = o.target.text;
    const decl = scope.decls.get(name);
    if (!o.field) {
      if (decl?.kind === 'param') {
        if (!scope.skipped.has(decl.statement)) params.set(name, o);
        continue;
      }
      ok = false;
      if (decl) {
        sink.error(
          'reference',
          `${quote(name)} is a ${decl.kind}; a corner overrides a parameter (\`gm1 = …\`) or a field (\`${name}.gm = …\`).`,
          o.targetRange,
        );
      } else {
        const near = closest(name, scope.params.keys());
        sink.error(
          'reference',
          `Undefined parameter ${quote(name)}.${near ? ` Did you mean ${quote(near)}?` : ''}`,
          o.targetRange,
        );
      }
      continue;
    }
    let target: Statement | undefined;
    if (decl?.kind === 'stage') target = decl.statement;
    else if (!decl && isOverriddenByKeyword(name)) target = unique(name, o);
    else {
      sink.error(
        'reference',
        decl
          ? `${quote(name)} is a ${decl.kind}; only stages and the ${KEYWORD_TARGETS} statements have fields.`
          : `Undefined name ${quote(name)}.`,
        tokenRange(o.target),
      );
      ok = false;
      continue;
    }
    if (!target) {
      ok = false;
      continue;
    }
    const allowed = FIELDS_BY_STATEMENT[target.kind] ?? [];
    if (!allowed.includes(o.field.text)) {
      const near = closest(o.field.text, allowed);
      sink.error(
        'reference',
        `${quote(target.kind)} has no field ${quote(o.field.text)} (fields: ${allowed.join(', ')}).${near ? ` Did you mean ${quote(near)}?` : ''}`,
        tokenRange(o.field),
      );
      ok = false;
      continue;
    }
    if (scope.skipped.has(target)) continue;
    let map = fields.get(target);
    if (!map) fields.set(target, (map = new Map()));
    map.set(o.field.text, o);
  }
  return { overrides: { params, fields }, ok };
}
