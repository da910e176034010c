// Physical range of each field: values that cannot exist (negative capacitance, zero resistance, NaN) are
// errors; values many decades off the usual range are warnings, because a missing SI prefix is the usual
// cause (`cc = 1.2 F` meant `1.2 pF`). The usual ranges are common practice for integrated amplifiers,
// kept wide enough for board-level loads.
import { formatSi } from '../format/si';
import { quote, type Reporter } from './diagnostics';
import type { Expr } from './expression';
import type { SourceRange } from './source';
import { PREFIX_SCALES } from './unitTable';

export type ValueRole =
  | 'gm'
  | 'gm-buffer'
  | 'rout'
  | 'rz'
  | 'res'
  | 'cap'
  | 'cap-board'
  | 'bias'
  | 'beta'
  | 'ugf'
  | 'pm'
  | 'gainmargin'
  | 'dcgain'
  | 'zero'
  | 'slew'
  | 'tolerance'
  | 'within';

interface Rule {
  readonly unit: string;
  /** Below `low` or above `high` (absolute SI) draws a warning. */
  readonly low: number;
  readonly high: number;
  /** A typical value, to pick the prefix a suggestion uses. */
  readonly typical: number;
  readonly what: string;
}

const RULES: Readonly<Record<ValueRole, Rule>> = {
  gm: { unit: 'S', low: 1e-9, high: 1, typical: 1e-4, what: 'a transconductance' },
  'gm-buffer': { unit: 'S', low: 1e-9, high: 1, typical: 1e-4, what: 'a transconductance' },
  rout: { unit: 'ohm', low: 10, high: 1e12, typical: 1e5, what: 'a stage output resistance' },
  rz: { unit: 'ohm', low: 1, high: 1e8, typical: 1e3, what: 'a nulling resistor' },
  res: { unit: 'ohm', low: 1e-3, high: 1e13, typical: 1e4, what: 'a resistance' },
  cap: { unit: 'F', low: 1e-18, high: 1e-6, typical: 1e-12, what: 'an on-chip capacitance' },
  'cap-board': { unit: 'F', low: 1e-18, high: 1e-2, typical: 1e-12, what: 'a capacitance' },
  bias: { unit: 'A', low: 1e-12, high: 10, typical: 1e-5, what: 'a bias current' },
  beta: { unit: '', low: 1e-9, high: 1, typical: 1, what: 'a feedback factor' },
  ugf: { unit: 'Hz', low: 1, high: 1e12, typical: 1e7, what: 'a unity-gain frequency' },
  pm: { unit: 'deg', low: 0, high: 180, typical: 60, what: 'a phase margin' },
  gainmargin: { unit: 'dB', low: 0, high: 100, typical: 10, what: 'a gain margin' },
  dcgain: { unit: 'dB', low: -40, high: 250, typical: 80, what: 'a DC gain' },
  zero: { unit: '', low: 0, high: 1e4, typical: 10, what: 'a zero-to-UGF ratio' },
  slew: { unit: 'V/s', low: 1e3, high: 1e13, typical: 1e6, what: 'a slew rate' },
  tolerance: { unit: '', low: 1e-9, high: 0.5, typical: 1e-3, what: 'a settling tolerance' },
  within: { unit: 's', low: 1e-13, high: 1e3, typical: 1e-6, what: 'a settling time' },
};

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

/**
 * Checks one evaluated value; returns false when it is physically impossible (reported as an error), in which
 * case the statement is left out of the model.
 */
/** The parameter a field names, when the field is exactly that parameter and it is set by a literal. */
export interface ViaParam {
  readonly name: string;
  readonly literal: Expr;
}

export function checkValue(
  role: ValueRole,
  field: string,
  value: number,
  expr: Expr,
  range: SourceRange,
  sink: Reporter,
  via?: ViaParam,
): boolean {
  const rule = RULES[role];
  const name = quote(field);
  if (!Number.isFinite(value)) {
    sink.error(
      'plausibility',
      `The value of ${name} is not a finite number (a division by zero, or a number too large?).`,
      range,
    );
    return false;
  }
  const impossible = (message: string): false => {
    sink.error('plausibility', message, range);
    return false;
  };
  switch (role) {
    case 'gm':
      if (value < 0)
        return impossible(
          `A transconductance cannot be negative: write ${name} as a positive value and add \`inverting\`.`,
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
    const usual = `${show(rule.low, rule.unit)} to ${show(rule.high, rule.unit)}`;
    const meant = suggestion && (via ? `${via.name} = ${suggestion}` : suggestion);
    sink.warning(
      'plausibility',
      `${show(value, rule.unit)} is far outside the usual range for ${rule.what} (${usual}).` +
        (meant ? ` A missing prefix? Did you mean ${quote(meant)}?` : ''),
      range,
      via ? [{ range: via.literal.range, message: `${quote(via.name)} is set here` }] : undefined,
    );
  }
  return true;
}
