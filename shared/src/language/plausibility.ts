// The one place that judges a value against its field's range (valueRanges.ts): values that cannot exist
// (negative capacitance, zero resistance) or that no circuit has (beyond ANALYSABLE_MAGNITUDE) are errors and
// keep the value from the model; values many decades off the usual range are warnings, because a missing SI
// prefix is the usual cause (`cc = 1.2 F` meant `1.2 pF`).
import { formatSi } from '../format/si';
import { quote, quoteShort, type Reporter } from './diagnostics';
import type { Expr } from './expression';
import type { SourceRange } from './source';
import { PREFIX_SCALES } from './unitTable';
import { ANALYSABLE_MAGNITUDE, VALUE_RANGES, type ValueRange, type ValueRole } from './valueRanges';

export type { ValueRole } from './valueRanges';

type Rule = ValueRange;

const SLEW_SPELLINGS: readonly [string, number][] = [
  ['V/s', 1],
  ['V/ms', 1e3],
  ['V/us', 1e6],
  ['V/ns', 1e9],
];

/** `1.2 pF` for a literal that was probably meant with another prefix. */
function suggestPrefix(expr: Expr, rule: Rule): string | undefined {
  if (expr.kind !== 'number' || !rule.unit || rule.unit === 'deg' || rule.unit === 'dB') return undefined;
  // A literal in exponent form was written deliberately; a prefix would only obscure it.
  if (/[eE]/.test(expr.numberText)) return undefined;
  const n = Number(expr.numberText);
  if (!(n > 0)) return undefined;
  const options: [string, number][] =
    rule.unit === 'V/s'
      ? SLEW_SPELLINGS.map(([s, k]) => [s, k])
      : Object.entries(PREFIX_SCALES)
          .filter(([p]) => p !== '\u00b5' && p !== '\u03bc' && p !== 'a')
          .map(([p, k]) => [p + rule.unit, k] as [string, number])
          .concat([[rule.unit, 1]]);
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const [spelling, k] of options) {
    const v = n * k;
    if (v < rule.low || v > rule.high) continue;
    const d = Math.abs(Math.log10(v / rule.typical));
    if (d < bestDistance) [best, bestDistance] = [`${expr.numberText} ${spelling}`, d];
  }
  return best;
}

const show = (v: number, unit: string): string =>
  unit ? formatSi(v, unit) : String(Number(v.toPrecision(3)));

/** A role's usual range as people read it (`1 nS to 1 S`): in messages and in the docs' table. */
export function usualRange(role: ValueRole): string {
  const r = VALUE_RANGES[role];
  return `${show(r.low, r.unit)} to ${show(r.high, r.unit)}`;
}

/** `1e308 F`: as written for a literal, else the value in exponent form (a prefix would hide its size). */
function written(value: number, expr: Expr, rule: Rule): string {
  // A plain literal takes the field's unit, so it is shown with it.
  const unit = expr.kind === 'number' ? (expr.unitText ?? rule.unit) : rule.unit;
  if (expr.kind === 'number') return quoteShort(`${expr.numberText}${unit ? ` ${unit}` : ''}`, 40);
  return `${exponent(value)}${unit ? ` ${unit}` : ''}`;
}

/** `1e308`, `2.5e-31`: three significant digits in exponent form. */
const exponent = (v: number): string =>
  v
    .toExponential(2)
    .replace(/\.?0+e/, 'e')
    .replace('e+', 'e');

/** The parameter a field names, when the field is exactly that parameter and it is set by a literal. */
export interface ViaParam {
  readonly name: string;
  readonly literal: Expr;
}

/**
 * Checks one evaluated value; returns false when it is impossible or beyond analysis (reported as an error),
 * in which case the statement is left out of the model.
 */
export function checkValue(
  role: ValueRole,
  field: string,
  value: number,
  expr: Expr,
  range: SourceRange,
  sink: Reporter,
  via?: ViaParam,
): boolean {
  const rule = VALUE_RANGES[role];
  const name = quote(field);
  if (!Number.isFinite(value)) {
    sink.error(
      'plausibility',
      `The value of ${name} is not a finite number (a division by zero, or a number too large?).`,
      range,
    );
    return false;
  }
  const setBy = via ? [{ range: via.literal.range, message: `${quote(via.name)} is set here` }] : undefined;
  const impossible = (message: string): false => {
    sink.error('plausibility', message, range, setBy);
    return false;
  };
  const magnitude = Math.abs(value);
  if (value !== 0 && (magnitude < ANALYSABLE_MAGNITUDE.low || magnitude > ANALYSABLE_MAGNITUDE.high))
    return impossible(
      `${written(value, via?.literal ?? expr, rule)} is not a plausible ${rule.noun}: values this far beyond any circuit cannot be analysed (magnitudes from ${exponent(ANALYSABLE_MAGNITUDE.low)} to ${exponent(ANALYSABLE_MAGNITUDE.high)} are accepted).`,
    );
  switch (role) {
    case 'gm':
    case 'gm-stage':
      if (value < 0)
        return impossible(
          `A transconductance cannot be negative: write ${name} as a positive value and add \`inverting\`.`,
        );
      // A stage without gain leaves the amplifier without gain: no rule's verdict on it would mean anything.
      if (value === 0 && role === 'gm-stage')
        return impossible(
          `A stage's ${name} of zero leaves the amplifier without gain; it must be positive.`,
        );
      if (value === 0) {
        sink.warning('plausibility', `${name} is zero: this path carries no signal.`, range);
        return true;
      }
      break;
    case 'gm-buffer':
      if (value <= 0) return impossible(`The buffer's ${name} must be positive.`);
      break;
    case 'rout':
    case 'res':
      if (value <= 0)
        return impossible(
          value === 0
            ? `A resistance of zero is a short circuit; ${name} must be positive.`
            : `A resistance cannot be negative; ${name} must be positive.`,
        );
      break;
    case 'rz':
      if (value < 0) return impossible(`A resistance cannot be negative; ${name} must be zero or positive.`);
      if (value === 0) return true;
      break;
    case 'cap':
    case 'cap-board':
      if (value < 0) return impossible(`A capacitance cannot be negative; ${name} must be zero or positive.`);
      if (value === 0) return true;
      break;
    case 'bias':
      if (value <= 0) return impossible(`A bias current must be positive.`);
      break;
    case 'beta':
      if (value <= 0) return impossible(`The feedback factor must be positive.`);
      if (value > 1) {
        sink.warning(
          'plausibility',
          `A feedback factor above 1 means a closed-loop gain below 1; is that intended?`,
          range,
        );
        return true;
      }
      return true;
    case 'ugf':
    case 'slew':
    case 'within':
    case 'step':
    case 'zero':
      if (value <= 0)
        return impossible(`${rule.what[0]!.toUpperCase()}${rule.what.slice(1)} must be positive.`);
      break;
    case 'tolerance':
      if (value <= 0 || value >= 1)
        return impossible(
          `A settling tolerance must lie between 0 and 100 % (it is ${show(value * 100, '')} %).`,
        );
      break;
    case 'pm':
      if (value < 0 || value >= 180) return impossible(`A phase margin must lie between 0 and 180 deg.`);
      return true;
    case 'gainmargin':
    case 'dcgain':
      break;
  }
  const mag = role === 'gainmargin' || role === 'dcgain' ? value : Math.abs(value);
  if (mag < rule.low || mag > rule.high) {
    const suggestion = suggestPrefix(via?.literal ?? expr, rule);
    const usual = usualRange(role);
    const meant = suggestion && (via ? `${via.name} = ${suggestion}` : suggestion);
    sink.warning(
      'plausibility',
      `${show(value, rule.unit)} is far outside the usual range for ${rule.what} (${usual}).` +
        (meant ? ` A missing prefix? Did you mean ${quote(meant)}?` : ''),
      range,
      setBy,
    );
  }
  return true;
}
