// Checks on values that are exact states of a network rather than ordinary numbers: a DC gain of zero
// (DC blocked) or infinity (an integrator), a pole and a zero at the origin, a slew rate with nothing to
// charge, a step response that could not be computed. Findings say so in words.
import { describe, expect, it } from 'vitest';
import { dcGainCheck } from '../../../shared/src/checks/dcGain';
import { measure } from '../../../shared/src/checks/measure';
import { doubletCheck, doubletSpread } from '../../../shared/src/checks/doublet';
import { settlingCheck, settlingTimeFor } from '../../../shared/src/checks/settling';
import { slewRateCheck } from '../../../shared/src/checks/slewRate';
import { DC_GAIN_UNBOUNDED, DC_GAIN_ZERO, NOT_COMPUTED } from '../../../shared/src/format/special';
import type { Requirement } from '../../../shared/src/language/model';
import { analyzeDocument } from '../../../shared/src/service';
import { analysis, BASE, input, LINE, node, origin, pole, twoStage, zero } from './fixtures';

const FORBIDDEN = /NaN|Infinity|undefined|\[object/;
const dcReq = (op: '>=' | '<=', db: number): Requirement => ({
  kind: 'dc-gain',
  op,
  value: db as never,
  origin: origin(LINE.require),
});
const settleReq = (tolerance: number): Requirement => ({
  kind: 'settle',
  tolerance: tolerance as never,
  within: 500e-9 as never,
  origin: origin(LINE.require),
});

describe('dc-gain on a gain of zero, infinity or not computed', () => {
  it('a gain of exactly zero is "no DC path", never −∞ dB', () => {
    const model = twoStage({ ...BASE, requirements: [dcReq('>=', 20)] });
    const found = dcGainCheck(input([{ model, analysis: analysis({ dcGain: 0 }) }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.message).toContain(DC_GAIN_ZERO);
    expect(found[0]!.message).not.toMatch(FORBIDDEN);
    expect(found[0]!.message).not.toContain('raise gm·rout');
  });

  it('an integrator meets a minimum and misses a maximum, in words', () => {
    const min = twoStage({ ...BASE, requirements: [dcReq('>=', 60)] });
    expect(dcGainCheck(input([{ model: min, analysis: analysis({ dcGain: Infinity }) }]))).toEqual([]);
    const max = twoStage({ ...BASE, requirements: [dcReq('<=', 60)] });
    const found = dcGainCheck(input([{ model: max, analysis: analysis({ dcGain: -Infinity }) }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.message).toContain(DC_GAIN_UNBOUNDED);
    expect(found[0]!.message).not.toMatch(FORBIDDEN);
  });

  it('a gain that was not computed cannot be judged, and says so', () => {
    const model = twoStage({ ...BASE, requirements: [dcReq('>=', 60)] });
    const found = dcGainCheck(input([{ model, analysis: analysis({ dcGain: NaN }) }]));
    expect(found[0]!.severity).toBe('info');
    expect(found[0]!.message).toContain(NOT_COMPUTED);
  });

  it('a finite miss of a maximum asks to lower gm·rout (20·log10 of 1e4 is 80 dB)', () => {
    const model = twoStage({ ...BASE, requirements: [dcReq('<=', 60)] });
    const found = dcGainCheck(input([{ model, analysis: analysis({ dcGain: -1e4 }) }]));
    expect(found[0]!.message).toContain('80.0 dB');
    expect(found[0]!.message).toContain('lower gm·rout');
  });
});

describe('doublet with roots at the origin', () => {
  it('a pole and a zero both at the origin cancel exactly; a zero elsewhere is no doublet of it', () => {
    expect(doubletSpread(0, 0)).toBe(0);
    expect(doubletSpread(1e3, 0)).toBe(Infinity);
    // |1.1 − 1| / 1 = 10 % (the definition the rule states).
    expect(doubletSpread(1.1e6, 1e6)).toBeCloseTo(0.1, 12);
  });

  it('does not report "NaN %" for a pole and zero at the origin', () => {
    const model = twoStage({ ...BASE, rz: 2e3 });
    const a = analysis({
      poles: [pole(0), pole(1e6)],
      zeros: [zero(0, false), zero(2e3, false)],
      loop: { ugfHz: 20e6 },
    });
    for (const spread of [0.2, 5, Infinity]) {
      for (const f of doubletCheck(input([{ model, analysis: a }], { doubletSpread: spread }))) {
        expect(f.message).not.toMatch(FORBIDDEN);
      }
    }
    expect(doubletCheck(input([{ model, analysis: a }]))).toEqual([]);
  });
});

describe('slew rate at the ends of the range', () => {
  const req = (value: number): Requirement => ({
    kind: 'slew',
    op: '<=',
    value: value as never,
    origin: origin(LINE.require),
  });
  it('an unbounded rate is shown in words and ranked without dividing by zero', () => {
    const model = twoStage({ ...BASE, bias1: 1e300, requirements: [req(0)] });
    const a = analysis({
      extra: {
        slew: {
          rate: Infinity,
          limits: [{ stage: node('first'), current: 1e300, cap: 1e-300, rate: Infinity }],
        },
      },
    });
    const found = slewRateCheck(input([{ model, analysis: a }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.message).not.toMatch(FORBIDDEN);
    expect(found[0]!.related[0]!.message).toContain('0 V/µs');
  });
});

describe('settling when the step response is missing', () => {
  it('a refused tolerance is a warning on the requirement with the reason', () => {
    const model = twoStage({ ...BASE, requirements: [settleReq(1e-15)] });
    const a = analysis({ extra: { stepUnavailable: 'whatever the engine said' } });
    const found = settlingCheck(input([{ model, analysis: a }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.severity).toBe('warning');
    expect(found[0]!.message).toMatch(/^Settling cannot be checked: the settling tolerance/);
    expect(found[0]!.message).not.toMatch(FORBIDDEN);
  });

  it('a step response the engine could not compute passes its reason on', () => {
    const model = twoStage({ ...BASE, requirements: [settleReq(1e-3)] });
    const a = analysis({
      extra: { stepUnavailable: 'the step response leaves the range of double precision' },
    });
    const found = settlingCheck(input([{ model, analysis: a }]));
    expect(found[0]!.message).toBe(
      'Settling cannot be checked: the step response leaves the range of double precision',
    );
  });

  it('settlingTimeFor refuses a tolerance below 1e-12 and measures a zero final value against the peak', () => {
    // y = e^(−t): outside ±0.1 of the peak 1 until t = ln 10 (closed form); grid of 0.1 s.
    const t = Array.from({ length: 101 }, (_, i) => i / 10);
    const step = { t, y: t.map((x) => Math.exp(-x)), final: 0, overshootPct: 0, tolerance: 0.5 };
    expect(settlingTimeFor(step, 5e-324)).toBeUndefined();
    expect(settlingTimeFor(step, 0.1)).toBeCloseTo(Math.ceil(Math.log(10) * 10) / 10, 12);
  });
});

describe('measurements shown in hovers, hints and summaries', () => {
  it('an integrator passes a minimum DC gain in words, with no margin of ∞ dB', () => {
    const m = measure(dcReq('>=', 60), analysis({ dcGain: Infinity }));
    expect(m.measured).toBe(DC_GAIN_UNBOUNDED);
    expect(m.pass).toBe(true);
    expect(m.margin).toBeUndefined();
  });

  it('a blocked DC path fails a minimum DC gain in words', () => {
    const m = measure(dcReq('>=', 20), analysis({ dcGain: 0 }));
    expect(m.measured).toBe(DC_GAIN_ZERO);
    expect(m.pass).toBe(false);
  });

  it('a step response that could not be computed says why instead of "does not settle"', () => {
    const m = measure(settleReq(1e-3), analysis({ extra: { stepUnavailable: 'the reason' } }));
    expect(m.measured).toBe('not computed: the reason');
    expect(m.pass).toBe(false);
  });
});

describe('whole documents with a series capacitor and an integrator', () => {
  it('no finding shows NaN, Infinity or undefined', () => {
    const text = [
      'design blocked',
      '  node a',
      '  element gm in -> a = 100 uS',
      '  element res a gnd = 1 Mohm',
      '  element cap a out = 1 pF',
      '  element res out gnd = 10 kohm',
      '  output out',
      '  require dcgain >= 20 dB',
      'end',
    ].join('\n');
    const report = analyzeDocument(text);
    const dc = report.findings.find((f) => f.code === 'dc-gain');
    expect(dc?.message).toContain(DC_GAIN_ZERO);
    for (const f of report.findings) {
      expect(f.message).not.toMatch(FORBIDDEN);
      for (const r of f.related) expect(r.message).not.toMatch(FORBIDDEN);
    }
  });
});
