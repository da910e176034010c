// The pole-split panel in headless Chromium, fed with PanelData computed by the real engine: what the charts
// hold must be the engine's numbers, markers must sit where the analysis puts them, user text stays text,
// and the page runs under its strict Content-Security-Policy without a single violation.
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseDocument } from '../../shared/src/language';
import { analyzeDesign, sweepCompensation } from '../../shared/src/analysis';
import type { DesignModel } from '../../shared/src/language/model';
import type { CompensationTarget, PanelData } from '../../shared/src/protocol/panelData';
import { buildPanelData, sweepValues } from '../../shared/src/panel/buildPanelData';
import { symlog } from '../../shared/src/charts/symlog';
import { positionToValue } from '../../client/src/webview/sliderScale';
import { formatSi } from '../../shared/src/format/si';
import { panelHtml } from '../../client/src/panelHtml';
import {
  OUTPUT,
  ROOT,
  openPanel,
  readCharts,
  startHarness,
  type Drawn,
  type Harness,
  type PanelPage,
} from './harness';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);

/** A two-stage design of our own (invented values) for the closed-form checks below. */
const TWO_STAGE = `design webview_two_stage
  param gm1 = 180 uS
  stage first   gm = gm1    rout = 1.5 Mohm   cap = 120 fF
  stage second  gm = 2.4 mS rout = 90 kohm    cap = 300 fF   inverting
  load          cap = 2.5 pF
  miller first -> second   cc = 1.2 pF
  feedback beta = 1
  require pm  >= 60 deg
  require ugf >= 10 MHz
end
`;

interface Case {
  readonly label: string;
  readonly uri: string;
  readonly model: DesignModel;
}

function casesFrom(label: string, uri: string, text: string): Case[] {
  const doc = parseDocument(text);
  return doc.designs
    .filter((d) => d.nominal)
    .map((d) => ({ label: `${label}:${d.name}`, uri, model: d.nominal! }));
}

function exampleCases(): Case[] {
  const dir = join(ROOT, 'examples');
  let files: string[] = [];
  try {
    files = readdirSync(dir).filter((f) => f.endsWith('.ampnote'));
  } catch {
    files = [];
  }
  return files.flatMap((f) => casesFrom(f, `file://${join(dir, f)}`, readFileSync(join(dir, f), 'utf8')));
}

const fixture = casesFrom(
  'fixture',
  pathToFileURL(resolve('test/webview/fixture/webview.ampnote')).href,
  TWO_STAGE,
);
const cases: Case[] = [...fixture, ...exampleCases()];

function panelData(
  c: Case,
  over: { cc?: number; rz?: number; compensation?: CompensationTarget } = {},
): PanelData {
  const d = buildPanelData(c.model, c.uri, over);
  if (!d) throw new Error('buildPanelData returned nothing without cancellation');
  // The server sends it as JSON over the language-server connection: compare what survives that trip.
  return JSON.parse(JSON.stringify(d)) as PanelData;
}

const byRole = (drawn: Drawn, chart: keyof Drawn, role: string) =>
  drawn[chart].filter((d) => d.role === role);

let h: Harness;
let panel: PanelPage;

beforeAll(async () => {
  h = await startHarness();
  panel = await openPanel(h);
});

afterAll(async () => {
  await h?.close();
});

describe('panel page', () => {
  it('is generated with a strict policy and the nonce on its only script', () => {
    const html = panelHtml({
      nonce: 'abc123',
      cspSource: 'https://x.test',
      scriptUri: 'https://x.test/p.js',
      styleUri: 'https://x.test/p.css',
    });
    const csp = /http-equiv="Content-Security-Policy" content="([^"]+)"/.exec(html)?.[1] ?? '';
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain("script-src 'nonce-abc123'");
    expect(csp).toContain('style-src https://x.test');
    expect(csp).toContain('img-src https://x.test data:');
    // base-uri and form-action do not fall back to default-src (CSP Level 3, §6.3 and §6.4).
    expect(csp).toContain("base-uri 'none'");
    expect(csp).toContain("form-action 'none'");
    expect(csp).not.toContain('unsafe');
    expect(html.match(/<script/g)?.length).toBe(1);
    expect(html).toContain('<script nonce="abc123" src="https://x.test/p.js">');
    expect(html).not.toMatch(/\son[a-z]+=/i);
  });

  it('serves a fresh nonce on every load', async () => {
    const first = h.lastNonce();
    const other = await openPanel(h);
    expect(h.lastNonce()).not.toBe(first);
    expect(h.lastNonce()).toMatch(/^[0-9a-f]{32}$/);
    await other.page.close();
  });
});

describe.each(cases.map((c) => [c.label, c] as const))('engine data for %s', (_label, c) => {
  it('draws the engine’s poles, sweep, loop gain and step, with markers where the analysis puts them', async () => {
    const data = panelData(c);
    expect(data.problems).toEqual([]);
    await panel.showData(data);
    const drawn = await readCharts(panel.page);

    // (a) locus: every branch drawn point for point as the engine swept it, Cc = 0 at the left edge.
    const branches = byRole(drawn, 'locus', 'pole-branch');
    expect(branches.length).toBe(data.locus.poles.length);
    branches.forEach((b, k) => {
      expect(b.data.map((p) => p.y)).toEqual(data.locus.poles[k]!.hz);
      expect(b.data.map((p) => p.cc)).toEqual(data.locus.poles[k]!.cc);
    });
    const zeroBranches = byRole(drawn, 'locus', 'zero-branch');
    expect(zeroBranches.map((b) => b.data.map((p) => p.y))).toEqual(data.locus.zeros.map((s) => s.hz));
    if (data.compensation) {
      expect(data.locus.poles[0]!.cc[0]).toBe(0);
      const xs = branches.flatMap((b) => b.data.map((p) => p.x));
      const positive = branches.flatMap((b) => b.data.filter((p) => (p.cc ?? 0) > 0).map((p) => p.x));
      expect(branches[0]!.data[0]!.x).toBe(Math.min(...xs));
      expect(branches[0]!.data[0]!.x).toBeLessThan(Math.min(...positive));
      // Far past the written value on the right.
      expect(Math.max(...xs)).toBeGreaterThanOrEqual(10 * data.compensation.ccWritten);

      // The current-Cc marker sits at the written value, and the locus there is the analysis of the design.
      const marker = byRole(drawn, 'locus', 'current-cc')[0]!;
      expect(marker.data.map((p) => p.x)).toEqual([data.compensation.ccWritten, data.compensation.ccWritten]);
      const exact = analyzeDesign(c.model)
        .poles.map((p) => p.hz)
        .sort((a, b) => a - b);
      const atWritten = branches
        .map((b) => b.data.find((p) => p.cc === data.compensation!.ccWritten)?.y)
        .filter((v): v is number => v !== undefined);
      expect(atWritten.length).toBe(exact.length);
      // The locus is swept on the realisation's roots without the analysis' Newton polishing: equal to
      // the polished roots to a few parts in 10⁹.
      atWritten.forEach((hz, k) => expect(rel(hz, exact[k]!)).toBeLessThan(1e-8));
      const current = byRole(drawn, 'locus', 'current-pole')[0]!;
      expect(current.data.map((p) => p.y).sort((a, b) => a - b)).toEqual(exact);
    }

    // (b) loop gain: the drawn curve is the engine's response; the UGF marker is at the analysis' crossing and
    // the drawn magnitude passes 0 dB between the grid points around it.
    const mag = byRole(drawn, 'bode', 'magnitude')[0]!;
    expect(mag.data.map((p) => p.y)).toEqual(data.bode.magDb);
    expect(mag.data.map((p) => p.x)).toEqual(data.bode.hz);
    expect(byRole(drawn, 'bode', 'phase')[0]!.data.map((p) => p.y)).toEqual(data.bode.phaseDeg);
    const analysis = analyzeDesign(c.model);
    if (analysis.loop.ugfHz !== undefined) {
      const ugf = byRole(drawn, 'bode', 'ugf')[0]!;
      expect(ugf.data.map((p) => p.x)).toEqual([analysis.loop.ugfHz, analysis.loop.ugfHz]);
      const i = mag.data.findIndex((p) => p.x > analysis.loop.ugfHz!);
      expect(i).toBeGreaterThan(0);
      expect(Math.sign(mag.data[i - 1]!.y)).not.toBe(Math.sign(mag.data[i]!.y));
      const crossings = byRole(drawn, 'bode', 'crossing')[0]!;
      expect(crossings.data.map((p) => p.x)).toEqual(analysis.loop.crossings.map((k) => k.hz));
      expect(crossings.data.every((p) => p.y === 0)).toBe(true);
      const pm = byRole(drawn, 'bode', 'phase-margin')[0]!;
      expect(pm.data[0]!.y).toBe(-180);
      expect(pm.data[1]!.y).toBeCloseTo(analysis.loop.phaseMarginDeg! - 180, 9);
      // The drawn phase at the crossing agrees with the margin (linear interpolation on the log grid).
      const ph = byRole(drawn, 'bode', 'phase')[0]!.data;
      const f = Math.log(analysis.loop.ugfHz / ph[i - 1]!.x) / Math.log(ph[i]!.x / ph[i - 1]!.x);
      const phaseAt = ph[i - 1]!.y + f * (ph[i]!.y - ph[i - 1]!.y);
      expect(Math.abs(phaseAt - (analysis.loop.phaseMarginDeg! - 180))).toBeLessThan(1.5);
    }

    // (c) step with its settling band.
    const step = byRole(drawn, 'step', 'step')[0]!;
    expect(step.data.map((p) => p.y)).toEqual(data.step.y);
    if (data.step.t.length > 0) {
      const band = Math.abs(data.step.final) * data.step.tolerance;
      expect(byRole(drawn, 'step', 'band-low')[0]!.data[0]!.y).toBeCloseTo(data.step.final - band, 12);
      expect(byRole(drawn, 'step', 'band-high')[0]!.data[0]!.y).toBeCloseTo(data.step.final + band, 12);
    }

    // (d) s-plane: one × per pole of the analysis at its symmetric-log position, one ○ per zero.
    const poles = byRole(drawn, 'splane', 'pole')[0]!;
    expect(poles.data.map((p) => [p.re, p.im])).toEqual(analysis.poles.map((p) => [p.s.re, p.s.im]));
    const roots = [
      ...analysis.poles.map((p) => p.s),
      ...analysis.zeros.map((z) => z.s),
      ...(analysis.closedLoopPoles ?? []),
    ];
    const knee =
      Math.min(...roots.flatMap((s) => [Math.abs(s.re), Math.abs(s.im)]).filter((v) => v > 0)) / 10;
    poles.data.forEach((p) => {
      expect(p.x).toBeCloseTo(symlog(p.re!, knee), 9);
      expect(p.y).toBeCloseTo(symlog(p.im!, knee), 9);
    });
    // The closed loop's poles beside them (◇): the engine's, one for one.
    const closed = byRole(drawn, 'splane', 'closed-pole')[0]!;
    expect(closed.data.map((p) => [p.re, p.im])).toEqual(
      (analysis.closedLoopPoles ?? []).map((s) => [s.re, s.im]),
    );
    // As many as the open loop's, plus one exactly at 0 per held charge (a node reached only through
    // capacitors: its pole cancels in the open loop's transfer but stays a natural frequency).
    const atOrigin = (s: { re: number; im: number }) => s.re === 0 && s.im === 0;
    const held =
      (analysis.closedLoopPoles ?? []).filter(atOrigin).length -
      analysis.poles.filter((p) => atOrigin(p.s)).length;
    expect(closed.data.length).toBe(analysis.poles.length + Math.max(0, held));
    expect(byRole(drawn, 'splane', 'zero')[0]!.data.length).toBe(
      analysis.zeros.filter((z) => Number.isFinite(z.s.re)).length,
    );

    expect(await panel.page.textContent('#caution')).toBe(data.caution);
    await panel.page.screenshot({
      path: join(OUTPUT, `${c.label.replace(/[^\w.-]+/g, '_')}-dark.png`),
      fullPage: true,
    });
    expect(panel.problems).toEqual([]);
    expect(await panel.page.evaluate(() => window.__violations)).toEqual([]);
  });
});

describe('closed forms', () => {
  const c = fixture[0]!;
  const m = c.model;
  const [s1, s2] = m.stages;
  const cl = m.loads[0]?.cap ?? 0;

  it('puts the uncompensated (Cc = 0) poles at 1/(2π·R·C) of each node', () => {
    // With Cc = 0 the two nodes only couple forward through gm, so each node's pole is its own RC
    // (single-pole RC, any circuits text).
    const data = panelData(c);
    const atZero = data.locus.poles
      .map((s) => (s.cc[0] === 0 ? s.hz[0] : undefined))
      .filter((v): v is number => v !== undefined);
    const expected = [
      1 / (2 * Math.PI * s1!.rout * s1!.cap),
      1 / (2 * Math.PI * s2!.rout * (s2!.cap + cl)),
    ].sort((a, b) => a - b);
    expect(atZero.length).toBe(2);
    atZero.forEach((hz, k) => expect(rel(hz, expected[k]!)).toBeLessThan(1e-9));
  });

  it('follows the two-stage Miller denominator along the whole sweep', () => {
    // D(s) = 1 + s[(C1+Cc)R1 + (C2+Cc)R2 + gm2R1R2Cc] + s²R1R2(C1C2 + Cc(C1+C2))
    // (two-stage Miller denominator, Gray/Hurst/Lewis/Meyer ch. 9, from memory, re-derived).
    const data = panelData(c);
    const R1 = s1!.rout,
      C1 = s1!.cap,
      R2 = s2!.rout,
      C2 = s2!.cap + cl,
      g2 = s2!.gm;
    const [lo, hi] = data.locus.poles;
    lo!.cc.forEach((cc, i) => {
      const a = R1 * R2 * (C1 * C2 + cc * (C1 + C2));
      const b = (C1 + cc) * R1 + (C2 + cc) * R2 + g2 * R1 * R2 * cc;
      const disc = Math.sqrt(b * b - 4 * a);
      // Roots of a s² + b s + 1: the small one by the stable form 2/(b + √…), the large one (b + √…)/(2a).
      const pSmall = 2 / (b + disc) / (2 * Math.PI);
      const pLarge = (b + disc) / (2 * a) / (2 * Math.PI);
      expect(rel(lo!.hz[i]!, pSmall)).toBeLessThan(1e-7);
      expect(rel(hi!.hz[i]!, pLarge)).toBeLessThan(1e-7);
    });
    // The right-half-plane zero at +gm2/Cc (same source).
    const z = data.zeros.find((q) => q.rhp)!;
    expect(rel(z.s.re, g2 / m.millers[0]!.cc)).toBeLessThan(1e-9);
  });
});

describe('interaction', () => {
  const c = fixture[0]!;

  it('shows a hostile design name and problem text as text, never as markup', async () => {
    const hostile = '<img src=x onerror=alert(1)>';
    const data = { ...panelData(c), design: hostile, problems: [`<b>bold</b> ${hostile}`] };
    await panel.showData(data);
    expect(await panel.page.textContent('#design-name')).toBe(hostile);
    expect(await panel.page.textContent('#problems li')).toBe(`<b>bold</b> ${hostile}`);
    expect(await panel.page.locator('img').count()).toBe(0);
    expect(await panel.page.locator('#problems b').count()).toBe(0);
    await panel.page.screenshot({ path: join(OUTPUT, 'hostile-name.png') });
    expect(panel.dialogs).toEqual([]);
    expect(panel.problems).toEqual([]);
    expect(await panel.page.evaluate(() => window.__violations)).toEqual([]);
  });

  it('moves Cc with the slider, asks the host, and redraws the answer', async () => {
    const data = panelData(c);
    await panel.showData(data);
    await panel.page.evaluate(() => (window.__posted.length = 0));
    const position = 700;
    await panel.page.locator('#cc-slider').evaluate((el, v) => {
      (el as HTMLInputElement).value = String(v);
      el.dispatchEvent(new Event('input', { bubbles: true }));
    }, position);
    const expectedCc = positionToValue(position, data.sliders!.cc, false);
    const posted = await panel.posted();
    const slider = posted.find((m) => m.type === 'slider');
    expect(slider).toMatchObject({ type: 'slider', cc: expectedCc });
    // The host answers with the engine's data at that Cc.
    const moved = panelData(c, { cc: expectedCc });
    await panel.showData(moved);
    const drawn = await readCharts(panel.page);
    expect(byRole(drawn, 'locus', 'current-cc')[0]!.data[0]!.x).toBe(expectedCc);
    const exact = analyzeDesign({
      ...c.model,
      millers: [{ ...c.model.millers[0]!, cc: expectedCc as never }],
    })
      .poles.map((p) => p.hz)
      .sort((a, b) => a - b);
    expect(
      byRole(drawn, 'locus', 'current-pole')[0]!
        .data.map((p) => p.y)
        .sort((a, b) => a - b),
    ).toEqual(exact);
    expect(await panel.page.textContent('#cc-value')).toMatch(/F$/);
    await panel.page.screenshot({ path: join(OUTPUT, 'slider-moved.png'), fullPage: true });

    // Apply sends the slider's values; the edit itself is the host's (an ordinary workspace edit).
    await panel.page.click('#apply');
    expect((await panel.posted()).find((m) => m.type === 'apply')).toMatchObject({
      type: 'apply',
      cc: expectedCc,
    });
  });

  it('sweeps the element chosen in the selector, and draws the engine’s sweep of that element', async () => {
    const nested = cases.find((k) => k.model.millers.length > 1);
    expect(nested, 'an example with two Miller capacitors').toBeDefined();
    const m = nested!.model;
    const first = panelData(nested!);
    await panel.showData(first);
    expect(await panel.page.isVisible('#cc-target')).toBe(true);
    const labels = await panel.page.locator('#cc-target option').allTextContents();
    expect(labels).toEqual(m.millers.map((x) => `miller ${x.from} -> ${x.to}`));
    expect(await panel.page.inputValue('#cc-target')).toBe('miller:0');

    await panel.page.evaluate(() => (window.__posted.length = 0));
    await panel.page.selectOption('#cc-target', 'miller:1');
    const target = { kind: 'miller', index: 1 } as const;
    expect((await panel.posted()).find((x) => x.type === 'compensation')).toEqual({
      type: 'compensation',
      target,
    });
    expect(
      await panel.page.evaluate(() => (window.__state as { compensation?: unknown }).compensation),
    ).toEqual(target);

    // The host answers with the engine's data for that element.
    const inner = panelData(nested!, { compensation: target });
    expect(inner.compensation).toMatchObject({ ...target, ccWritten: m.millers[1]!.cc });
    await panel.send({ type: 'data', data: inner });
    await panel.page.waitForFunction(
      (cc) =>
        (window as unknown as { __ampnoteData?: { compensation?: { ccWritten: number } } }).__ampnoteData
          ?.compensation?.ccWritten === cc,
      m.millers[1]!.cc,
    );
    const drawn = await readCharts(panel.page);
    // Independent of the panel's own code path: the engine's sweep of the inner capacitor, root by root.
    const values = sweepValues(m.millers[1]!.cc, m.millers[1]!.cc, 15);
    const points = sweepCompensation(m, { ...target, field: 'cc' }, values);
    const branches = byRole(drawn, 'locus', 'pole-branch');
    const count = Math.max(...points.map((p) => p.poles.length));
    expect(branches.length).toBe(count);
    branches.forEach((b, k) => {
      const expected = points
        .map((p) => {
          const s = [...p.poles].sort((a, z) => Math.hypot(a.re, a.im) - Math.hypot(z.re, z.im))[k];
          return s && Math.hypot(s.re, s.im) > 0
            ? { cc: p.value, hz: Math.hypot(s.re, s.im) / (2 * Math.PI) }
            : undefined;
        })
        .filter((v) => v !== undefined);
      expect(b.data.map((p) => p.cc)).toEqual(expected.map((e) => e!.cc));
      b.data.forEach((p, i) => expect(rel(p.y, expected[i]!.hz)).toBeLessThan(1e-12));
    });
    expect(byRole(drawn, 'locus', 'current-cc')[0]!.data[0]!.x).toBe(m.millers[1]!.cc);
    // Both sweeps pass through the design as written, but they differ elsewhere.
    expect(branches[0]!.data.map((p) => p.y)).not.toEqual(first.locus.poles[0]!.hz);
    expect(await panel.page.inputValue('#cc-target')).toBe('miller:1');
    await panel.page.screenshot({ path: join(OUTPUT, 'nested-inner-selected.png'), fullPage: true });

    // A slider moved now moves the inner capacitor; choosing again drops that value.
    await panel.page.locator('#cc-slider').evaluate((el) => {
      (el as HTMLInputElement).value = '650';
      el.dispatchEvent(new Event('input', { bubbles: true }));
    });
    await panel.send({ type: 'data', data: inner });
    await panel.page.selectOption('#cc-target', 'miller:0');
    expect(await panel.page.evaluate(() => window.__state)).toMatchObject({
      compensation: { kind: 'miller', index: 0 },
      cc: undefined,
    });
    await panel.showData(first);
    expect(panel.problems).toEqual([]);
    expect(await panel.page.evaluate(() => window.__violations)).toEqual([]);
  });

  it('hides the selector when the design has a single compensation element', async () => {
    await panel.showData(panelData(c));
    expect(await panel.page.isVisible('#cc-target')).toBe(false);
    expect(await panel.page.textContent('#cc-what')).toBe('miller first -> second');
  });

  it('marks the settling instant and magnifies the band at the default view', async () => {
    const data = panelData(c);
    expect(typeof data.step.settlingTime).toBe('number');
    await panel.showData(data);
    const marks = () =>
      panel.page.evaluate(() => {
        const s = (window as unknown as { __ampnoteCharts: Record<string, any> }).__ampnoteCharts.step;
        const x = s.scales.x;
        return {
          inset: s.$settlingInset as
            | {
                box: { x: number; y: number; width: number; height: number };
                tMin: number;
                tMax: number;
                yMin: number;
                yMax: number;
              }
            | undefined,
          tag: s.$settlingTag as { x: number; text: string } | undefined,
          tagX: x.getPixelForValue(
            (window as unknown as { __ampnoteData: { step: { settlingTime: number } } }).__ampnoteData.step
              .settlingTime,
          ) as number,
          area: s.chartArea as { left: number; right: number; top: number; bottom: number },
        };
      });
    const band = Math.abs(data.step.final) * data.step.tolerance;
    let m = await marks();
    // The tag sits on the settling instant and names it; the inset spans a few band widths around the
    // final value and a window that holds the settling instant, inside the plot area.
    expect(m.tag!.text).toBe(`settled ${formatSi(data.step.settlingTime!, 's')}`);
    expect(m.tag!.x).toBeCloseTo(m.tagX, 6);
    expect(m.inset!.yMin).toBeCloseTo(data.step.final - 4 * band, 12);
    expect(m.inset!.yMax).toBeCloseTo(data.step.final + 4 * band, 12);
    expect(m.inset!.tMin).toBeLessThan(data.step.settlingTime!);
    expect(m.inset!.tMax).toBe(data.step.t.at(-1));
    expect(m.inset!.box.x).toBeGreaterThanOrEqual(m.area.left);
    expect(m.inset!.box.x + m.inset!.box.width).toBeLessThanOrEqual(m.area.right);
    expect(m.inset!.box.y + m.inset!.box.height).toBeLessThanOrEqual(m.area.bottom);
    await panel.page.locator('#card-step').screenshot({ path: join(OUTPUT, 'step-default.png') });
    await panel.page.click('#card-step .card-title');
    await panel.page.waitForFunction(
      () =>
        (window as unknown as { __ampnoteCharts: Record<string, any> }).__ampnoteCharts.step.chartArea.width >
        600,
    );
    await panel.page.locator('#card-step').screenshot({ path: join(OUTPUT, 'step-default-selected.png') });
    await panel.theme('light');
    await panel.page.waitForTimeout(0);
    await panel.page.locator('#card-step').screenshot({ path: join(OUTPUT, 'step-default-light.png') });
    await panel.theme('dark');
    // Zoomed to the band, the main axes show it: no inset then.
    await panel.page.click('#step-zoom');
    m = await marks();
    expect(m.inset).toBeUndefined();
    expect(m.tag).toBeDefined();
    await panel.page.click('#step-zoom');
    await panel.page.click('#card-locus .card-title');
    expect(panel.problems).toEqual([]);
  });

  it('zooms the step chart to its settling band and remembers it', async () => {
    const data = panelData(c);
    await panel.showData(data);
    const yRange = () =>
      panel.page.evaluate(() => {
        const y = (window as unknown as { __ampnoteCharts: Record<string, any> }).__ampnoteCharts.step.scales
          .y;
        return { min: y.min as number, max: y.max as number };
      });
    const full = await yRange();
    await panel.page.click('#step-zoom');
    const band = Math.abs(data.step.final) * data.step.tolerance;
    const zoomed = await yRange();
    expect(zoomed.min).toBeCloseTo(data.step.final - 6 * band, 12);
    expect(zoomed.max).toBeCloseTo(data.step.final + 6 * band, 12);
    expect(zoomed.max - zoomed.min).toBeLessThan(full.max - full.min);
    expect(await panel.page.evaluate(() => (window.__state as { stepBandZoom?: boolean }).stepBandZoom)).toBe(
      true,
    );
    expect(await panel.page.getAttribute('#step-zoom', 'aria-pressed')).toBe('true');
    await panel.page.locator('#card-step').screenshot({ path: join(OUTPUT, 'step-band-zoom.png') });
    await panel.page.click('#step-zoom');
    expect((await yRange()).max - (await yRange()).min).toBeCloseTo(full.max - full.min, 9);
  });

  it('shows a pole’s value and node participation when hovered', async () => {
    const data = panelData(c);
    await panel.showData(data);
    for (const chart of ['splane', 'locus'] as const) {
      const role = chart === 'splane' ? 'pole' : 'current-pole';
      const at = await panel.page.evaluate(
        ({ chart, role }) => {
          const c = (window as unknown as { __ampnoteCharts: Record<string, any> }).__ampnoteCharts[chart];
          const i = c.data.datasets.findIndex((d: { role: string }) => d.role === role);
          const el = c.getDatasetMeta(i).data[0];
          const box = c.canvas.getBoundingClientRect();
          return { x: box.left + el.x, y: box.top + el.y, hz: c.data.datasets[i].data[0].pole.hz as number };
        },
        { chart, role },
      );
      await panel.page.mouse.move(at.x, at.y);
      const lines = await panel.page.waitForFunction((chart) => {
        const c = (window as unknown as { __ampnoteCharts: Record<string, any> }).__ampnoteCharts[chart];
        const body = c.tooltip?.opacity > 0 ? c.tooltip.body : undefined;
        return body ? body.flatMap((b: { lines: string[] }) => b.lines) : undefined;
      }, chart);
      const text = ((await lines.jsonValue()) as string[]).join('\n');
      const pole = data.poles.find((p) => p.hz === at.hz)!;
      expect(text).toContain('participation:');
      for (const q of pole.participation.filter((q) => q.share >= 0.005)) {
        expect(text).toContain(`${q.node} ${(100 * q.share).toFixed(1)} %`);
      }
      await panel.page.screenshot({ path: join(OUTPUT, `hover-${chart}.png`) });
      await panel.page.mouse.move(1, 1);
    }
  });

  it('exports a chart as PNG and its data as CSV through the host', async () => {
    const data = panelData(c);
    await panel.showData(data);
    await panel.page.evaluate(() => (window.__posted.length = 0));
    await panel.page.click('#card-locus button[data-action="png"]');
    await panel.page.click('#card-bode button[data-action="csv"]');
    const posted = await panel.posted();
    const png = posted.find((m) => m.type === 'exportPng');
    expect(png).toMatchObject({ type: 'exportPng', chart: 'locus' });
    const bytes = Buffer.from((png as { dataUrl: string }).dataUrl.split(',')[1]!, 'base64');
    expect(bytes.subarray(1, 4).toString('latin1')).toBe('PNG');
    writeFileSync(join(OUTPUT, 'export-locus.png'), bytes);
    const csv = (posted.find((m) => m.type === 'exportCsv') as { csv: string; chart: string }).csv
      .trim()
      .split('\n');
    expect(csv[0]).toBe('frequency_Hz,loop_gain_dB,loop_phase_deg');
    expect(csv.length).toBe(data.bode.hz.length + 1);
    const [f, db] = csv[1]!.split(',').map(Number);
    expect(f).toBe(data.bode.hz[0]);
    expect(db).toBe(data.bode.magDb[0]);
  });

  it('keeps the selected chart in the webview state and redraws in the new theme colours', async () => {
    const data = panelData(c);
    await panel.showData(data);
    await panel.page.click('#card-bode .card-title');
    expect(await panel.page.evaluate(() => (window.__state as { selected: string }).selected)).toBe('bode');
    // The design shown is kept too, so a panel restored after a reload can ask for it again.
    expect(await panel.page.evaluate(() => window.__state)).toMatchObject({
      uri: data.uri,
      design: data.design,
    });
    expect(await panel.page.locator('#card-bode.selected').count()).toBe(1);
    const tickColor = () =>
      panel.page.evaluate(() => {
        const chart = (
          window as unknown as {
            __ampnoteCharts: Record<string, { options: { scales: { x: { ticks: { color: string } } } } }>;
          }
        ).__ampnoteCharts.bode;
        return chart.options.scales.x.ticks.color;
      });
    expect(await tickColor()).toBe('#9d9d9d');
    await panel.theme('light');
    await panel.page.waitForFunction(
      () =>
        (
          window as unknown as {
            __ampnoteCharts: Record<string, { options: { scales: { x: { ticks: { color: string } } } } }>;
          }
        ).__ampnoteCharts.bode.options.scales.x.ticks.color === '#717171',
    );
    await panel.page.screenshot({ path: join(OUTPUT, 'light-theme-bode-selected.png'), fullPage: true });
    await panel.theme('dark');
    await panel.page.click('#card-locus .card-title');
    expect(panel.problems).toEqual([]);
    expect(await panel.page.evaluate(() => window.__violations)).toEqual([]);
  });

  it('lists the modelling problems the engine reports, with empty charts and no script error', async () => {
    const [broken] = casesFrom(
      'broken',
      pathToFileURL(resolve('test/webview/fixture/broken.ampnote')).href,
      `design floating_node
  node a
  stage first gm = 100 uS rout = 1 Mohm cap = 100 fF
  element gm first -> a = 1 mS
  element gm a -> out = 1 mS
  miller first -> out cc = 1 pF
  output out
end
`,
    );
    const data = panelData(broken!);
    expect(data.problems.length).toBeGreaterThan(0);
    await panel.showData(data);
    expect(await panel.page.locator('#problems li').allTextContents()).toEqual(data.problems);
    const drawn = await readCharts(panel.page);
    expect(byRole(drawn, 'splane', 'pole')[0]!.data).toEqual([]);
    expect(byRole(drawn, 'locus', 'pole-branch')).toEqual([]);
    await panel.page.screenshot({ path: join(OUTPUT, 'problems.png') });
    expect(panel.problems).toEqual([]);
  });

  it('draws an unstable loop’s growing step without a settling band', async () => {
    const nested = cases.find((k) => k.model.millers.length > 1);
    if (!nested) return;
    // A far too small outer capacitor: the engine finds a closed-loop pole in the right half-plane.
    const data = panelData(nested, { cc: nested.model.millers[0]!.cc / 200 });
    expect(data.step.stable).toBe(false);
    await panel.showData(data);
    const drawn = await readCharts(panel.page);
    expect(byRole(drawn, 'step', 'step')[0]!.data.map((p) => p.y)).toEqual(data.step.y);
    expect(byRole(drawn, 'step', 'band-low')).toEqual([]);
    expect(byRole(drawn, 'step', 'settling')).toEqual([]);
    expect(
      await panel.page.evaluate(
        () =>
          (window as unknown as { __ampnoteCharts: Record<string, any> }).__ampnoteCharts.step.$settlingInset,
      ),
    ).toBeUndefined();
    expect(await panel.page.textContent('#note-step')).toMatch(/unstable/);
    const closed = byRole(drawn, 'splane', 'closed-pole')[0]!.data;
    expect(closed.some((p) => p.re! > 0 && p.x > 0)).toBe(true);
    await panel.page.screenshot({ path: join(OUTPUT, 'unstable.png'), fullPage: true });
    expect(panel.problems).toEqual([]);
  });

  it('survives numbers that crossed JSON as null (NaN, infinities)', async () => {
    const base = panelData(c);
    const data = JSON.parse(
      JSON.stringify({
        ...base,
        summary: { ...base.summary, phaseMarginDeg: Number.NaN, gainMarginDb: Infinity },
        bode: { ...base.bode, ugfHz: Number.NaN, phaseMarginDeg: Number.NaN },
        step: { ...base.step, overshootPct: Number.NaN },
      }),
    ) as PanelData;
    await panel.showData(data);
    const terms = await panel.page.locator('#summary dt').allTextContents();
    const summary = await panel.page.locator('#summary dd').allTextContents();
    expect(summary[terms.indexOf('phase margin')]).toBe('—');
    // A margin that crossed JSON as null cannot be read back: "not computed", never a number or "unbounded".
    expect(summary[terms.indexOf('gain margin')]).toBe('not computed');
    const drawn = await readCharts(panel.page);
    expect(byRole(drawn, 'bode', 'ugf')).toEqual([]);
    expect(panel.problems).toEqual([]);
  });

  it('says "unbounded" for the gain margin of a loop whose phase never reaches −180°', async () => {
    // The engine leaves gainMarginDb out when the phase never crosses −180° (analysis/types.ts).
    const base = panelData(c);
    const { gainMarginDb: _absent, ...summary } = base.summary;
    await panel.showData({ ...base, summary });
    const terms = await panel.page.locator('#summary dt').allTextContents();
    const values = await panel.page.locator('#summary dd').allTextContents();
    expect(values[terms.indexOf('gain margin')]).toBe('unbounded');
    expect(panel.problems).toEqual([]);
  });

  it('fits a narrow panel beside the editor without sideways scrolling', async () => {
    const narrow = await openPanel(h, { width: 480, height: 1400 });
    const c3 = cases.find((k) => k.model.millers.length > 1) ?? c;
    await narrow.showData(panelData(c3));
    const overflow = await narrow.page.evaluate(
      () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
    );
    expect(overflow).toBeLessThanOrEqual(0);
    await narrow.page.screenshot({ path: join(OUTPUT, 'narrow.png'), fullPage: true });
    expect(narrow.problems).toEqual([]);
    expect(await narrow.page.evaluate(() => window.__violations)).toEqual([]);
    await narrow.page.close();
  });

  it('shows an empty state when no design is under the cursor', async () => {
    await panel.send({ type: 'data', data: null });
    await panel.page.waitForFunction(() => document.getElementById('app')!.classList.contains('empty'));
    expect(await panel.page.isVisible('#empty-note')).toBe(true);
    expect(await panel.page.isVisible('#grid')).toBe(false);
  });
});
