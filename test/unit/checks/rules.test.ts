import { describe, expect, it } from 'vitest';
import { approximationCheck } from '../../../shared/src/checks/approximation';
import { complexPolesCheck } from '../../../shared/src/checks/complexPoles';
import { dcGainCheck } from '../../../shared/src/checks/dcGain';
import { doubletCheck } from '../../../shared/src/checks/doublet';
import { gainMarginCheck } from '../../../shared/src/checks/gainMargin';
import { gmRatioCheck } from '../../../shared/src/checks/gmRatio';
import { languageFindings, runChecks } from '../../../shared/src/checks/index';
import { nondominantPoleCheck } from '../../../shared/src/checks/nondominantPole';
import { phaseMarginCheck } from '../../../shared/src/checks/phaseMargin';
import { rhpZeroCheck } from '../../../shared/src/checks/rhpZero';
import { secondStageBandwidthCheck, stageUnityHz } from '../../../shared/src/checks/secondStageBandwidth';
import { settlingCheck, settlingTimeFor } from '../../../shared/src/checks/settling';
import { slewRateCheck } from '../../../shared/src/checks/slewRate';
import { unityGainCheck } from '../../../shared/src/checks/unityGain';
import { roundedCandidates } from '../../../shared/src/checks/fixes';
import type { ParsedDocument } from '../../../shared/src/language/model';
import {
  BASE,
  LINE,
  analysis,
  input,
  origin,
  pole,
  requirePm,
  twoStage,
  zero,
  node,
  range,
} from './fixtures';

const TWO_PI = 2 * Math.PI;

describe('phase margin', () => {
  it('flags a margin below the default on the Miller capacitor, as a warning', () => {
    const model = twoStage(BASE);
    const found = phaseMarginCheck(
      input([{ model, analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 45 } }) }]),
    );
    expect(found).toHaveLength(1);
    expect(found[0]!.code).toBe('phase-margin');
    expect(found[0]!.severity).toBe('warning');
    expect(found[0]!.range).toEqual(model.millers[0]!.origin.fields['cc']!.range);
    expect(found[0]!.message).toContain('45.0°');
    expect(found[0]!.message).toContain('60.0°');
    // Without an engine no fix is solved, and stating the default would change nothing in the design.
    expect(found[0]!.fixes).toEqual([]);
  });

  it('passes at the default, and a stated requirement overrides the default', () => {
    const plain = twoStage(BASE);
    const a = analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 65 } });
    expect(phaseMarginCheck(input([{ model: plain, analysis: a }]))).toEqual([]);
    const strict = twoStage({ ...BASE, requirements: [requirePm(70)] });
    const found = phaseMarginCheck(input([{ model: strict, analysis: a }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.severity).toBe('error');
    expect(found[0]!.related[0]!.range).toEqual(strict.requirements[0]!.origin.range);
    const lax = twoStage({ ...BASE, requirements: [requirePm(40)] });
    expect(
      phaseMarginCheck(
        input([{ model: lax, analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 45 } }) }]),
      ),
    ).toEqual([]);
  });

  it('settings change the default threshold', () => {
    const model = twoStage(BASE);
    const a = analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 65 } });
    expect(phaseMarginCheck(input([{ model, analysis: a }], { phaseMargin: 70 }))).toHaveLength(1);
  });

  it('names the corners a finding holds in, and says so', () => {
    const nominal = twoStage(BASE);
    const slow = twoStage({ ...BASE, gm2: 1.5e-3, corner: 'slow' });
    const found = phaseMarginCheck(
      input([
        { model: nominal, analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 65 } }) },
        { model: slow, corner: 'slow', analysis: analysis({ loop: { ugfHz: 19e6, phaseMarginDeg: 52 } }) },
      ]),
    );
    expect(found).toHaveLength(1);
    expect(found[0]!.corners).toEqual(['slow']);
    expect(found[0]!.message).toContain('52.0°');
    expect(found[0]!.message).toContain('only in corner slow');
  });

  it('holding in every corner leaves corners unset and names the worst', () => {
    const found = phaseMarginCheck(
      input([
        { model: twoStage(BASE), analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 55 } }) },
        {
          model: twoStage(BASE),
          corner: 'hot',
          analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 50 } }),
        },
      ]),
    );
    expect(found[0]!.corners).toBeUndefined();
    expect(found[0]!.message).toContain('worst: hot');
  });

  it('leaves a network with no stage, feedback or loop requirement to the requirements it states', () => {
    const network = { ...twoStage(BASE), stages: [] };
    const a = analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 40 } });
    expect(phaseMarginCheck(input([{ model: network, analysis: a }]))).toEqual([]);
    const stated = { ...network, requirements: [requirePm(60)] };
    expect(phaseMarginCheck(input([{ model: stated, analysis: a }]))).toHaveLength(1);
  });

  it('an unstable loop is an error even against the default', () => {
    const found = phaseMarginCheck(
      input([{ model: twoStage(BASE), analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: -5 } }) }]),
    );
    expect(found[0]!.severity).toBe('error');
    expect(found[0]!.message).toContain('unstable');
  });
});

describe('gain margin', () => {
  it('flags a margin below 10 dB and several unity crossings', () => {
    const model = twoStage(BASE);
    const low = gainMarginCheck(
      input([{ model, analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 60, gainMarginDb: 8 } }) }]),
    );
    expect(low.map((f) => f.message)).toEqual([expect.stringContaining('8.0 dB')]);
    const ok = gainMarginCheck(
      input([{ model, analysis: analysis({ loop: { ugfHz: 20e6, phaseMarginDeg: 60, gainMarginDb: 14 } }) }]),
    );
    expect(ok).toEqual([]);
    const multi = gainMarginCheck(
      input([
        {
          model,
          analysis: analysis({
            loop: {
              ugfHz: 30e6,
              phaseMarginDeg: 50,
              crossings: [
                { hz: 5e6, direction: 'down', phaseDeg: -120 },
                { hz: 12e6, direction: 'up', phaseDeg: -200 },
                { hz: 30e6, direction: 'down', phaseDeg: -130 },
              ],
            },
          }),
        },
      ]),
    );
    expect(multi).toHaveLength(1);
    expect(multi[0]!.message).toContain('3 times');
  });
});

describe('right-half-plane zero', () => {
  // Two-stage Miller with Rz = 0: z = gm2/Cc in the right half-plane (GHLM ch. 9, AH ch. 6; from memory).
  const zHz = BASE.gm2 / BASE.cc / TWO_PI; // ≈ 318 MHz
  it('flags a zero below 10 × UGF on the Miller line, with gm2 as related information', () => {
    const model = twoStage(BASE);
    const found = rhpZeroCheck(
      input([
        {
          model,
          analysis: analysis({ zeros: [zero(zHz, true)], loop: { ugfHz: 40e6, phaseMarginDeg: 60 } }),
        },
      ]),
    );
    expect(found).toHaveLength(1);
    expect(found[0]!.range).toEqual(model.millers[0]!.origin.range);
    expect(found[0]!.related[0]!.range).toEqual(model.stages[1]!.origin.fields['gm']!.range);
    expect(found[0]!.message).toContain('318 MHz');
    expect(found[0]!.message).toContain('no nulling resistor');
  });

  it('passes when the zero is a decade above, or moved to the left half-plane', () => {
    const model = twoStage(BASE);
    expect(
      rhpZeroCheck(
        input([{ model, analysis: analysis({ zeros: [zero(zHz, true)], loop: { ugfHz: 30e6 } }) }]),
      ),
    ).toEqual([]);
    expect(
      rhpZeroCheck(
        input([{ model, analysis: analysis({ zeros: [zero(100e6, false)], loop: { ugfHz: 40e6 } }) }]),
      ),
    ).toEqual([]);
  });

  it('follows `require zero >= k * ugf`', () => {
    const model = twoStage({
      ...BASE,
      requirements: [{ kind: 'zero', op: '>=', factor: 5 as never, origin: origin(LINE.require) }],
    });
    const a = analysis({ zeros: [zero(zHz, true)], loop: { ugfHz: 40e6 } });
    expect(rhpZeroCheck(input([{ model, analysis: a }]))).toEqual([]);
    const strict = twoStage({
      ...BASE,
      requirements: [{ kind: 'zero', op: '>=', factor: 20 as never, origin: origin(LINE.require) }],
    });
    const found = rhpZeroCheck(
      input([{ model: strict, analysis: analysis({ zeros: [zero(zHz, true)], loop: { ugfHz: 20e6 } }) }]),
    );
    expect(found).toHaveLength(1);
    expect(found[0]!.severity).toBe('error');
  });
});

describe('second-stage transconductance', () => {
  it('flags gm2 < 10·gm1 with no nulling resistor, on gm2', () => {
    const model = twoStage({ ...BASE, gm2: 1e-3 });
    const found = gmRatioCheck(input([{ model, analysis: analysis({ loop: { ugfHz: 20e6 } }) }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.range).toEqual(model.stages[1]!.origin.fields['gm']!.range);
    expect(found[0]!.message).toContain('6.67 × gm1');
    expect(found[0]!.related.map((r) => r.range)).toContainEqual(model.stages[0]!.origin.fields['gm']!.range);
  });
  it('is quiet at gm2 ≥ 10·gm1 or when a nulling resistor controls the zero', () => {
    expect(gmRatioCheck(input([{ model: twoStage(BASE), analysis: analysis({}) }]))).toEqual([]);
    expect(
      gmRatioCheck(input([{ model: twoStage({ ...BASE, gm2: 1e-3, rz: 1e3 }), analysis: analysis({}) }])),
    ).toEqual([]);
  });
});

describe('non-dominant pole', () => {
  it('flags p2 below 2.2 × UGF and passes above', () => {
    const model = twoStage(BASE);
    const low = analysis({
      poles: [
        pole(1e3),
        pole(30e6, [
          { node: 'second', share: 0.9 },
          { node: 'first', share: 0.1 },
        ]),
      ],
      loop: { ugfHz: 20e6 },
    });
    const found = nondominantPoleCheck(input([{ model, analysis: low }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.message).toContain('1.5 × the UGF');
    expect(found[0]!.related[0]!.message).toContain('second 90 %');
    const high = analysis({ poles: [pole(1e3), pole(50e6)], loop: { ugfHz: 20e6 } });
    expect(nondominantPoleCheck(input([{ model, analysis: high }]))).toEqual([]);
  });
  it('skips a pole cancelled by a LHP zero and judges the next one', () => {
    const model = twoStage(BASE);
    const a = analysis({
      poles: [pole(1e3), pole(30e6), pole(80e6)],
      zeros: [zero(30.1e6, false)],
      loop: { ugfHz: 20e6 },
    });
    expect(nondominantPoleCheck(input([{ model, analysis: a }]))).toEqual([]);
  });
});

describe('second-stage bandwidth', () => {
  // Single-pole stage: |gm·R/(1 + jωRC)| = 1 at ω = √((gmR)² − 1)/(RC) (elementary one-pole algebra).
  const model = twoStage({ ...BASE, gm2: 1e-3, r2: 100e3, c2: 1e-12, cl: 9e-12 });
  const limit = Math.sqrt(100 ** 2 - 1) / (100e3 * 10e-12) / TWO_PI; // ≈ 15.9 MHz
  it('computes the stage unity-gain frequency with its load', () => {
    expect(stageUnityHz(model, model.stages[1]!)).toBeCloseTo(limit, 0);
  });
  it('flags a required UGF above it, on gm2', () => {
    const req = (hz: number) =>
      twoStage({
        ...BASE,
        gm2: 1e-3,
        r2: 100e3,
        c2: 1e-12,
        cl: 9e-12,
        requirements: [{ kind: 'ugf', op: '>=', value: hz as never, origin: origin(LINE.require) }],
      });
    expect(secondStageBandwidthCheck(input([{ model: req(20e6), analysis: analysis({}) }]))).toHaveLength(1);
    expect(secondStageBandwidthCheck(input([{ model: req(10e6), analysis: analysis({}) }]))).toEqual([]);
  });
});

describe('complex poles and peaking', () => {
  it('flags a non-dominant pair with ζ < 0.5 and peaking above 1 dB', () => {
    const model = twoStage(BASE);
    const a = analysis({ poles: [pole(1e3), pole(40e6, [], 0.3)], loop: { ugfHz: 20e6, peakingDb: 2.5 } });
    const found = complexPolesCheck(input([{ model, analysis: a }]));
    expect(found.map((f) => f.message)).toEqual([
      expect.stringContaining('ζ = 0.30'),
      expect.stringContaining('2.50 dB'),
    ]);
    const calm = analysis({ poles: [pole(1e3), pole(40e6, [], 0.7)], loop: { ugfHz: 20e6, peakingDb: 0.3 } });
    expect(complexPolesCheck(input([{ model, analysis: calm }]))).toEqual([]);
  });
});

describe('doublet', () => {
  it('flags a LHP zero within 20 % of a pole below the UGF, not an exact cancellation', () => {
    const model = twoStage({ ...BASE, rz: 2e3 });
    const a = analysis({ poles: [pole(1e3), pole(1e6)], zeros: [zero(1.1e6, false)], loop: { ugfHz: 20e6 } });
    const found = doubletCheck(input([{ model, analysis: a }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.range).toEqual(model.millers[0]!.origin.fields['rz']!.range);
    expect(found[0]!.message).toContain('10.0 %');
    const exact = analysis({
      poles: [pole(1e3), pole(1e6)],
      zeros: [zero(1e6, false)],
      loop: { ugfHz: 20e6 },
    });
    expect(doubletCheck(input([{ model, analysis: exact }]))).toEqual([]);
    const above = analysis({
      poles: [pole(1e3), pole(50e6)],
      zeros: [zero(52e6, false)],
      loop: { ugfHz: 20e6 },
    });
    expect(doubletCheck(input([{ model, analysis: above }]))).toEqual([]);
  });
});

describe('slew rate', () => {
  // SR = min(I_tail/Cc, I_2/(Cc + CL)) (AH ch. 6, from memory): 10 µA / 1.1 pF = 9.09 V/µs.
  const req = {
    kind: 'slew' as const,
    op: '>=' as const,
    value: 12e6 as never,
    origin: origin(LINE.require),
  };
  it('flags a slew rate below the requirement on the limiting stage bias', () => {
    const model = twoStage({ ...BASE, bias1: 10e-6, bias2: 200e-6, requirements: [req] });
    const sr1 = 10e-6 / BASE.cc;
    const sr2 = 200e-6 / (BASE.cc + BASE.cl);
    const a = analysis({
      extra: {
        slew: {
          rate: Math.min(sr1, sr2),
          limits: [
            { stage: node('first'), current: 10e-6, cap: BASE.cc, rate: sr1 },
            { stage: node('second'), current: 200e-6, cap: BASE.cc + BASE.cl, rate: sr2 },
          ],
        },
      },
    });
    const found = slewRateCheck(input([{ model, analysis: a }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.range).toEqual(model.stages[0]!.origin.fields['bias']!.range);
    expect(found[0]!.message).toContain('9.09 V/µs');
  });
  it('says so when no bias is given', () => {
    const model = twoStage({ ...BASE, requirements: [req] });
    const found = slewRateCheck(input([{ model, analysis: analysis({}) }]));
    expect(found[0]!.severity).toBe('info');
  });
});

describe('settling', () => {
  // A first-order step 1 − e^(−t/τ) enters ±0.1 % at t = τ·ln(1000) (elementary).
  const tau = 10e-9;
  const t = Array.from({ length: 2001 }, (_, i) => (i * 200e-9) / 2000);
  const y = t.map((x) => 1 - Math.exp(-x / tau));
  const step = { t, y, final: 1, overshootPct: 0, tolerance: 0.01, settlingTime: tau * Math.log(100) };
  it('reads the settling time for another tolerance from the samples', () => {
    expect(settlingTimeFor(step, 0.001)).toBeCloseTo(tau * Math.log(1000), 9);
    expect(settlingTimeFor(step, 0.01)).toBe(step.settlingTime);
  });
  it('flags a design that settles later than required', () => {
    const mk = (within: number) =>
      twoStage({
        ...BASE,
        requirements: [
          {
            kind: 'settle',
            tolerance: 0.001 as never,
            within: within as never,
            origin: origin(LINE.require),
          },
        ],
      });
    expect(
      settlingCheck(input([{ model: mk(50e-9), analysis: analysis({ extra: { step } }) }])),
    ).toHaveLength(1);
    expect(settlingCheck(input([{ model: mk(100e-9), analysis: analysis({ extra: { step } }) }]))).toEqual(
      [],
    );
  });
});

describe('approximation, UGF, DC gain', () => {
  it('flags a hand formula more than 20 % off the exact root', () => {
    const a = analysis({
      extra: {
        hand: [
          {
            quantity: 'nondominant-pole',
            formula: 'gm2/(C1 + C2)',
            hand: 1.3e9,
            exact: 1e9,
            relativeError: 0.3,
          },
          {
            quantity: 'dominant-pole',
            formula: '1/(gm2·R1·R2·Cc)',
            hand: 1.05e3,
            exact: 1e3,
            relativeError: 0.05,
          },
        ],
      },
    });
    const found = approximationCheck(input([{ model: twoStage(BASE), analysis: a }]));
    expect(found).toHaveLength(1);
    expect(found[0]!.severity).toBe('info');
    expect(found[0]!.message).toContain('30 % off');
  });
  it('flags a missed UGF and DC gain requirement', () => {
    const model = twoStage({
      ...BASE,
      requirements: [
        { kind: 'ugf', op: '>=', value: 30e6 as never, origin: origin(5) },
        { kind: 'dc-gain', op: '>=', value: 90 as never, origin: origin(6) },
      ],
    });
    const a = analysis({ dcGain: -1e4, loop: { ugfHz: 20e6 } });
    expect(unityGainCheck(input([{ model, analysis: a }]))[0]!.message).toContain('20 MHz');
    expect(dcGainCheck(input([{ model, analysis: a }]))[0]!.message).toContain('80.0 dB');
  });
});

describe('runChecks and language findings', () => {
  it('a healthy design has no findings', () => {
    const model = twoStage({ ...BASE, rz: 500 });
    const a = analysis({
      poles: [pole(1e3), pole(60e6)],
      zeros: [zero(2e9, false)],
      loop: { ugfHz: 20e6, phaseMarginDeg: 70 },
    });
    expect(runChecks(input([{ model, analysis: a }]))).toEqual([]);
  });
  it('maps language diagnostics to findings of their design', () => {
    const model = twoStage(BASE);
    const parsed: ParsedDocument = {
      designs: [
        {
          name: 'amp',
          range: { start: { line: 0, character: 0 }, end: { line: 9, character: 3 } },
          nameRange: range(0, 7, 10),
          text: '',
          nominal: model,
          corners: [],
          symbols: [],
        },
      ],
      diagnostics: [
        { code: 'unit', severity: 'error', message: 'farads where ohms belong', range: range(2, 30, 36) },
        { code: 'syntax', severity: 'error', message: 'stray', range: range(11, 0, 3) },
      ],
    };
    const found = languageFindings(parsed);
    expect(found.map((f) => [f.code, f.design])).toEqual([
      ['unit', 'amp'],
      ['syntax', undefined],
    ]);
  });
});

describe('rounding for fixes', () => {
  it('tries the nearest 3-digit value, then safe neighbours', () => {
    expect(roundedCandidates(1.2345e-12, 'up')).toEqual([1.23e-12, 1.24e-12, 1.25e-12, 1.26e-12]);
    expect(roundedCandidates(454.545, 'nearest')).toEqual([455, 454]);
    expect(roundedCandidates(-1, 'up')).toEqual([]);
  });
});
