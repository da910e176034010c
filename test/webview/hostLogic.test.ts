// The pure parts of the client and the panel: message checks, the restart policy, the slider scale, the
// symmetric-log transform and CSV export.
import { describe, expect, it } from 'vitest';
import { applyRefusal, parseWebviewMessage } from '../../client/src/webviewGuard';
import { boundedRestarts } from '../../client/src/restartPolicy';
import {
  freePositionToValue,
  freeValueToPosition,
  positionToValue,
  valueToPosition,
  STEPS,
} from '../../client/src/webview/sliderScale';
import { symlog, symlogInverse, symlogKnee } from '../../shared/src/charts/symlog';
import { chartCsv } from '../../shared/src/charts/csv';
import { withAlpha } from '../../shared/src/charts/colors';
import { CAUTION, type PanelData } from '../../shared/src/protocol/panelData';

describe('messages from the webview', () => {
  it('keeps well-formed messages and drops values that are not finite and non-negative', () => {
    expect(parseWebviewMessage({ type: 'slider', cc: 2e-12, rz: 0 })).toEqual({
      type: 'slider',
      cc: 2e-12,
      rz: 0,
    });
    expect(parseWebviewMessage({ type: 'slider', cc: -1, rz: Number.NaN })).toEqual({
      type: 'slider',
      cc: undefined,
      rz: undefined,
    });
    // An apply passes every number on, so that the host refuses an unusable one with its reason instead
    // of writing the other value alone; what is not a number is no value.
    expect(parseWebviewMessage({ type: 'apply', cc: 0, rz: Number.POSITIVE_INFINITY })).toEqual({
      type: 'apply',
      cc: 0,
      rz: Number.POSITIVE_INFINITY,
    });
    expect(parseWebviewMessage({ type: 'apply', cc: '1p' })).toEqual({
      type: 'apply',
      cc: undefined,
      rz: undefined,
    });
  });

  it('keeps free-parameter values by name and drops a message whose values are not numbers', () => {
    expect(parseWebviewMessage({ type: 'free', values: { id1: 4e-6, cc: 1e-12 } })).toEqual({
      type: 'free',
      values: { id1: 4e-6, cc: 1e-12 },
    });
    // Numbers the engine cannot use are passed on, so that it refuses them with the reason.
    expect(parseWebviewMessage({ type: 'applyFree', values: { rz: -1 } })).toEqual({
      type: 'applyFree',
      values: { rz: -1 },
    });
    expect(parseWebviewMessage({ type: 'solve', extra: 1 })).toEqual({ type: 'solve' });
    for (const values of [undefined, null, 3, [1, 2], { id1: '4u' }, { id1: null }])
      expect(parseWebviewMessage({ type: 'free', values })).toBeUndefined();
  });

  it('refuses to apply values a design cannot hold, with the reason', () => {
    expect(applyRefusal(1.2e-12, 2e3)).toBeUndefined();
    expect(applyRefusal(1.2e-12, 0)).toBeUndefined(); // rz = 0 removes the nulling resistor
    // A capacitor of 0 F is no compensation at all: never written into the file from the panel.
    expect(applyRefusal(0, undefined)).toMatch(/cc is zero/);
    expect(applyRefusal(Number.MAX_VALUE, undefined)).toMatch(/cc = 1\.80e\+308 lies outside/);
    expect(applyRefusal(1e-31, undefined)).toMatch(/outside the values a design can hold/);
    expect(applyRefusal(1e-12, Number.NaN)).toMatch(/rz is not a finite number/);
    expect(applyRefusal(1e-12, -5)).toMatch(/rz is negative/);
    expect(applyRefusal(undefined, undefined)).toMatch(/no value/);
  });

  it('keeps a well-formed compensation choice and drops any other', () => {
    expect(parseWebviewMessage({ type: 'compensation', target: { kind: 'miller', index: 1 } })).toEqual({
      type: 'compensation',
      target: { kind: 'miller', index: 1 },
    });
    expect(parseWebviewMessage({ type: 'compensation', target: { kind: 'buffered', index: 0 } })).toEqual({
      type: 'compensation',
      target: { kind: 'buffered', index: 0 },
    });
    for (const target of [
      undefined,
      null,
      { kind: 'miller', index: -1 },
      { kind: 'miller', index: 0.5 },
      { kind: 'miller', index: '1' },
      { kind: 'resistor', index: 0 },
    ])
      expect(parseWebviewMessage({ type: 'compensation', target })).toBeUndefined();
  });

  it('rejects unknown types, unknown charts and data that is not a PNG', () => {
    expect(parseWebviewMessage(null)).toBeUndefined();
    expect(parseWebviewMessage('ready')).toBeUndefined();
    expect(parseWebviewMessage({ type: 'run', code: 'x' })).toBeUndefined();
    expect(parseWebviewMessage({ type: 'exportCsv', chart: 'nyquist', csv: 'a' })).toBeUndefined();
    expect(
      parseWebviewMessage({ type: 'exportPng', chart: 'bode', dataUrl: 'data:text/html;base64,PGI+' }),
    ).toBeUndefined();
    expect(
      parseWebviewMessage({ type: 'exportPng', chart: 'bode', dataUrl: 'data:image/png;base64,iVBO' }),
    ).toEqual({
      type: 'exportPng',
      chart: 'bode',
      dataUrl: 'data:image/png;base64,iVBO',
    });
  });
});

describe('restart policy', () => {
  it('restarts up to the limit within the window, then stops until old crashes age out', () => {
    const p = boundedRestarts(3, 60_000);
    expect([0, 1000, 2000].map((t) => p.shouldRestart(t))).toEqual([true, true, true]);
    expect(p.shouldRestart(3000)).toBe(false);
    expect(p.recent).toBe(4);
    // A minute after the first crashes they no longer count.
    expect(p.shouldRestart(63_500)).toBe(true);
    expect(p.recent).toBe(1);
  });
});

describe('slider scale', () => {
  const range = { min: 1e-14, max: 1e-10 };
  it('spans the range geometrically, ends included', () => {
    expect(positionToValue(0, range, false)).toBe(1e-14);
    expect(positionToValue(STEPS, range, false)).toBe(1e-10);
    // Halfway on a log scale of four decades is two decades up.
    expect(positionToValue(STEPS / 2, range, false)).toBeCloseTo(1e-12, 24);
  });
  it('maps a value back to its position, and 0 to the "none" end when zero is allowed', () => {
    for (const p of [1, 137, 500, 999]) {
      expect(Math.abs(valueToPosition(positionToValue(p, range, true), range, true) - p)).toBeLessThanOrEqual(
        1,
      );
    }
    expect(positionToValue(0, range, true)).toBe(0);
    expect(valueToPosition(0, range, true)).toBe(0);
    expect(valueToPosition(1, range, false)).toBe(STEPS);
  });
  it('runs a free parameter geometrically between positive bounds and linearly from 0, within the bounds', () => {
    const log = { low: 1e-6, high: 100e-6, log: true };
    // Halfway on a log scale of two decades is one decade up.
    expect(freePositionToValue(STEPS / 2, log)).toBeCloseTo(10e-6, 18);
    const linear = { low: 0, high: 50e3, log: false };
    expect(freePositionToValue(0, linear)).toBe(0);
    expect(freePositionToValue(STEPS / 2, linear)).toBe(25e3);
    expect(freePositionToValue(STEPS, linear)).toBe(50e3);
    // A bound with more digits than the slider's three: rounding never steps past it.
    const odd = { low: 1.2345e-12, high: 9.8765e-12, log: true };
    expect(freePositionToValue(0, odd)).toBe(1.2345e-12);
    expect(freePositionToValue(STEPS, odd)).toBe(9.8765e-12);
    for (const p of [0, 250, 731, STEPS])
      expect(freeValueToPosition(freePositionToValue(p, log), log)).toBe(p);
  });
});

describe('symmetric log', () => {
  it('is odd, invertible, linear near zero and logarithmic far out', () => {
    const v0 = 1e3;
    for (const v of [-1e9, -2.5e4, -1, 0, 3, 7e5, 1e12]) {
      expect(symlog(-v, v0)).toBeCloseTo(-symlog(v, v0), 12);
      expect(symlogInverse(symlog(v, v0), v0) / (v || 1)).toBeCloseTo(v === 0 ? 0 : 1, 9);
    }
    expect(symlog(1, v0)).toBeCloseTo(1 / (v0 * Math.LN10), 6);
    expect(symlog(1e9, v0) - symlog(1e8, v0)).toBeCloseTo(1, 5);
    expect(symlogKnee([0, -4e4, 2e6])).toBe(4e3);
  });
});

describe('CSV export and colours', () => {
  const data: PanelData = {
    uri: 'file:///x.ampnote',
    design: 'd',
    poles: [
      {
        s: { re: -10, im: 0 },
        hz: 10 / (2 * Math.PI),
        damping: 1,
        namedAfter: 'first',
        participation: [{ node: 'first', share: 1 }],
      },
    ],
    zeros: [],
    locus: { poles: [{ label: 'pole "1", lowest', cc: [0, 1e-12], hz: [5, 4] }], zeros: [] },
    bode: { hz: [1, 10], magDb: [20, 0], phaseDeg: [0, -45], crossings: [] },
    step: { t: [0, 1], y: [0, 1], final: 1, tolerance: 0.01, overshootPct: 0 },
    summary: { closedLoop: 'stable', dcGainDb: 20 },
    problems: [],
    caution: CAUTION,
  };
  it('quotes fields that hold commas or quotes, and writes one row per point', () => {
    expect(chartCsv('locus', data)).toBe(
      'series,cc_F,magnitude_Hz\n"pole ""1"", lowest",0,5\n"pole ""1"", lowest",1e-12,4\n',
    );
    expect(chartCsv('splane', data).split('\n')[1]).toBe(
      'pole,-10,0,1.5915494309189535,1,first,first:1.0000',
    );
    const closed = chartCsv('splane', { ...data, closedLoopPoles: [{ re: 3, im: -4 }] })
      .trim()
      .split('\n');
    expect(closed[closed.length - 1]).toBe(`closed-loop pole,3,-4,${5 / (2 * Math.PI)},,,`);
  });
  it('turns theme colours into rgba with the alpha asked for', () => {
    expect(withAlpha('#3794ff', 0.5)).toBe('rgba(55, 148, 255, 0.5)');
    expect(withAlpha('#fff', 1)).toBe('rgba(255, 255, 255, 1)');
    expect(withAlpha('rgb(1, 2, 3)', 0.2)).toBe('rgba(1, 2, 3, 0.2)');
  });
});
