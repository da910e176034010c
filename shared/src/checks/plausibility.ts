// Values far outside their field's usual range, and zero or negative R/C/gm. A missing SI prefix is the
// usual cause (`cc = 1.2 F` meant as 1.2 pF). The ranges are generous on purpose (common practice).
import { formatSi } from '../format/si';
import type { DesignModel, Origin } from '../language/model';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { fieldRange } from './locate';

interface Range {
  readonly what: string;
  readonly unit: string;
  readonly min: number;
  readonly max: number;
}

const GM: Range = { what: 'transconductance', unit: 'S', min: 1e-9, max: 10 };
const R: Range = { what: 'resistance', unit: 'ohm', min: 1e-2, max: 1e13 };
const NODE_C: Range = { what: 'node capacitance', unit: 'F', min: 1e-19, max: 1e-3 };
const LOAD_C: Range = { what: 'load capacitance', unit: 'F', min: 1e-18, max: 1e-1 };
const CC: Range = { what: 'compensation capacitor', unit: 'F', min: 1e-17, max: 1e-5 };
const BIAS: Range = { what: 'bias current', unit: 'A', min: 1e-12, max: 10 };

interface Value {
  readonly label: string;
  readonly value: number | undefined;
  readonly origin: Origin;
  readonly field: string;
  readonly range: Range;
  /** A node capacitance of 0 is a valid idealisation; a gm or R of 0 is not. */
  readonly zeroAllowed?: boolean;
}

function valuesOf(model: DesignModel): Value[] {
  const out: Value[] = [];
  for (const s of model.stages) {
    out.push({ label: `gm of stage ${s.name}`, value: s.gm, origin: s.origin, field: 'gm', range: GM });
    out.push({ label: `rout of stage ${s.name}`, value: s.rout, origin: s.origin, field: 'rout', range: R });
    out.push({
      label: `cap of stage ${s.name}`,
      value: s.cap,
      origin: s.origin,
      field: 'cap',
      range: NODE_C,
      zeroAllowed: true,
    });
    out.push({
      label: `bias of stage ${s.name}`,
      value: s.bias,
      origin: s.origin,
      field: 'bias',
      range: BIAS,
    });
  }
  for (const l of model.loads) {
    out.push({
      label: 'load cap',
      value: l.cap,
      origin: l.origin,
      field: 'cap',
      range: LOAD_C,
      zeroAllowed: true,
    });
    out.push({ label: 'load res', value: l.res, origin: l.origin, field: 'res', range: R });
  }
  for (const m of model.millers) {
    out.push({ label: 'Miller cc', value: m.cc, origin: m.origin, field: 'cc', range: CC });
    out.push({ label: 'Miller rz', value: m.rz, origin: m.origin, field: 'rz', range: R, zeroAllowed: true });
  }
  for (const b of model.buffered) {
    out.push({ label: 'buffered cc', value: b.cc, origin: b.origin, field: 'cc', range: CC });
    out.push({ label: 'buffer gm', value: b.gm, origin: b.origin, field: 'gm', range: GM });
    out.push({
      label: 'buffer cap',
      value: b.cap,
      origin: b.origin,
      field: 'cap',
      range: NODE_C,
      zeroAllowed: true,
    });
  }
  for (const e of model.elements) {
    const range = e.kind === 'res' ? R : e.kind === 'cap' ? NODE_C : GM;
    out.push({ label: `element ${e.kind}`, value: e.value, origin: e.origin, field: 'value', range });
  }
  return out;
}

export const plausibilityCheck: Check = (input: CheckInput) =>
  acrossRuns(input, 'plausibility', (run): Hit[] => {
    const hits: Hit[] = [];
    for (const v of valuesOf(run.model)) {
      if (v.value === undefined || !Number.isFinite(v.value)) continue;
      const range = fieldRange(v.origin, v.field);
      const key = `${range.start.line}:${range.start.character}`;
      if (v.value < 0 || (v.value === 0 && !v.zeroAllowed)) {
        hits.push({
          key,
          severity: 'error',
          message: `${v.label} is ${formatSi(v.value, v.range.unit)}: a ${v.range.what} must be positive`,
          range,
          related: [],
          badness: Infinity,
        });
        continue;
      }
      if (v.value === 0) continue;
      const decades =
        v.value > v.range.max
          ? Math.log10(v.value / v.range.max)
          : v.value < v.range.min
            ? Math.log10(v.range.min / v.value)
            : 0;
      if (decades <= 0) continue;
      hits.push({
        key,
        severity: 'warning',
        message:
          `${v.label} = ${formatSi(v.value, v.range.unit)} is ${decades >= 1 ? `${Math.floor(decades)}+ decades ` : ''}` +
          `${v.value > v.range.max ? 'above' : 'below'} the usual range of a ${v.range.what} ` +
          `(${formatSi(v.range.min, v.range.unit)} to ${formatSi(v.range.max, v.range.unit)}): a missing or wrong SI prefix?`,
        range,
        related: [],
        badness: decades,
      });
    }
    return hits;
  });
