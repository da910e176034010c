// The values a fix may change: a number the designer wrote as one literal. A field written as a literal is
// its own knob; a field that names a parameter whose value is a literal edits that parameter; a derived
// value (`gm = 2 * id2 / vov2`) is changed through the literal parameters it is derived from, never by
// replacing the expression with a number.
import { forEachRef, parseExpression, Cursor, type Expr } from '../language/expression';
import { lexLine } from '../language/lexer';
import type { DesignModel, FieldOrigin } from '../language/model';
import type { SourceRange } from '../language/source';

export interface Knob {
  /** The name the designer knows it by: the parameter's name, or the field's label (`cc`). */
  readonly name: string;
  /** The range of the literal in the document: a fix replaces exactly this. */
  readonly range: SourceRange;
  /** The literal's value in SI. */
  readonly value: number;
  /** The literal for SI value `v`, in the designer's own unit spelling (`4.52 pF`). */
  write(v: number): string;
  /** True when the knob is a parameter from which the field's value is derived, not the value itself. */
  readonly derived: boolean;
}

const SILENT = { error() {}, warning() {} };

/** The expression of a value's text, when the whole text is one expression. */
function parseValue(text: string): Expr | undefined {
  const lexed = lexLine(text, 0);
  const cursor = new Cursor(lexed.tokens);
  const expr = parseExpression(cursor, { sink: SILENT, stopWords: new Set() });
  return expr && cursor.atEnd() ? expr : undefined;
}

/** A knob on a literal's text, when the text is exactly one number with an optional unit. */
function literalKnob(name: string, origin: FieldOrigin, derived: boolean): Knob | undefined {
  const expr = parseValue(origin.text);
  if (!expr || expr.kind !== 'number' || !Number.isFinite(expr.value)) return undefined;
  const written = Number(expr.numberText);
  // The SI value of one unit as written (`pF` → 1e-12): from the literal itself, or from `1 unit` for 0.
  let scale = written !== 0 ? expr.value / written : 1;
  if (written === 0 && expr.unitText) {
    const one = parseValue(`1 ${expr.unitText}`);
    if (one?.kind === 'number') scale = one.value;
  }
  if (!(scale > 0) || !Number.isFinite(scale)) return undefined;
  const unitStart = expr.unitText ? origin.text.lastIndexOf(expr.unitText) : -1;
  const between = unitStart >= 0 ? origin.text.slice(expr.numberText.length, unitStart) : '';
  const unit = expr.unitText ?? '';
  return {
    name,
    range: origin.range,
    value: expr.value,
    derived,
    write: (v) => `${plainNumber(v / scale)}${unit ? (between || ' ') + unit : ''}`,
  };
}

/** A number as the language reads it, without the float noise of a division (3e-12 / 1e-12). */
function plainNumber(x: number): string {
  return String(Number(x.toPrecision(12)));
}

/**
 * The knobs that set a value: the value itself when it is a literal (or a parameter holding one), else
 * the literal parameters it is derived from, in the order the expression names them.
 */
export function knobsOf(model: DesignModel, origin: FieldOrigin, label: string): Knob[] {
  if (origin.param) return paramKnobs(model, origin.param, new Set(), false);
  const own = literalKnob(label, origin, false);
  if (own) return [own];
  return derivedKnobs(model, origin.text, new Set());
}

function paramKnobs(model: DesignModel, name: string, seen: Set<string>, derived: boolean): Knob[] {
  if (seen.has(name)) return [];
  seen.add(name);
  const value = model.params.find((p) => p.name === name)?.origin.fields['value'];
  if (!value) return [];
  if (value.param) return paramKnobs(model, value.param, seen, derived);
  const own = literalKnob(name, value, derived);
  return own ? [own] : derivedKnobs(model, value.text, seen);
}

function derivedKnobs(model: DesignModel, text: string, seen: Set<string>): Knob[] {
  const expr = parseValue(text);
  if (!expr) return [];
  const names: string[] = [];
  forEachRef(expr, (name) => {
    if (!names.includes(name)) names.push(name);
  });
  return names.flatMap((name) => paramKnobs(model, name, seen, true));
}

/** True when the text is one literal: the only kind of value a fix may overwrite. */
export function isLiteral(origin: FieldOrigin): boolean {
  return literalKnob('', origin, false) !== undefined;
}
