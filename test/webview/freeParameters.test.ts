// The panel for a design with free parameters, in headless Chromium: one slider per free parameter within
// its bounds, the requirements judged at the sliders' values in the worst corner, the objective, Solve and
// Apply. The test plays the host: it answers each message with what the server computes (buildPanelData
// on the design's source, solveDesign), and checks the numbers against the design's text edited by hand.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyzeDesign } from '../../shared/src/analysis';
import { DEFAULT_CHECK_SETTINGS } from '../../shared/src/checks/settings';
import { parseDocument } from '../../shared/src/language';
import type { DesignSource } from '../../shared/src/language/model';
import { buildPanelData } from '../../shared/src/panel/buildPanelData';
import type { PanelData } from '../../shared/src/protocol/panelData';
import type { WebviewToHost } from '../../shared/src/protocol/webviewMessages';
import { solveDesign } from '../../shared/src/solve/solveDesign';
import { freePositionToValue, freeValueToPosition } from '../../client/src/webview/sliderScale';
import { OUTPUT, ROOT, openPanel, readCharts, startHarness, type Harness, type PanelPage } from './harness';

const FILE = join(ROOT, 'examples', 'twoStageFromBiasCurrents.ampnote');
const TEXT = readFileSync(FILE, 'utf8');
const URI = `file://${FILE}`;
const source: DesignSource = parseDocument(TEXT).designs[0]!;

/** What the server sends for these slider values, after its trip through JSON. */
function hostData(free?: Record<string, number>): PanelData {
  const d = buildPanelData(source.nominal!, URI, { source, ...(free ? { free } : {}) });
  if (!d) throw new Error('buildPanelData returned nothing without cancellation');
  return JSON.parse(JSON.stringify(d)) as PanelData;
}

/**
 * The bounds as the example file writes them (`param id1 = 4 uA free 1 uA .. 40 uA`), read with a regular
 * expression and a prefix table of our own rather than the language's parser.
 */
const EXPONENT: Record<string, number> = { '': 0, k: 3, u: -6, p: -12, f: -15 };
const qty = (n: string, unit: string) => Number(`${n}e${EXPONENT[unit.replace(/(A|F|ohm)$/, '')]!}`);
const written = [
  ...TEXT.matchAll(/^\s*param (\w+)\s*=\s*([\d.]+) ?(\w*)\s+free ([\d.]+) ?(\w*) \.\. ([\d.]+) ?(\w*)/gm),
].map((m) => ({
  name: m[1]!,
  value: qty(m[2]!, m[3]!),
  low: qty(m[4]!, m[5]! || m[3]!),
  high: qty(m[6]!, m[7]!),
}));

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);

let h: Harness;
let panel: PanelPage;

beforeAll(async () => {
  h = await startHarness();
  panel = await openPanel(h);
});

afterAll(async () => {
  await h?.close();
});

async function show(data: PanelData): Promise<void> {
  await panel.send({ type: 'data', data });
  await panel.page.waitForFunction(
    (want) => {
      const d = (window as unknown as { __ampnoteData?: PanelData }).__ampnoteData;
      return JSON.stringify(d?.free?.sliders.map((s) => s.value)) === want;
    },
    JSON.stringify(data.free!.sliders.map((s) => s.value)),
  );
}

async function moveSlider(index: number, position: number): Promise<void> {
  await panel.page
    .locator('#free-sliders input[type="range"]')
    .nth(index)
    .evaluate((el, v) => {
      (el as HTMLInputElement).value = String(v);
      el.dispatchEvent(new Event('input', { bubbles: true }));
    }, position);
}

const lastPosted = async <T extends WebviewToHost['type']>(type: T) =>
  (await panel.posted()).filter((m) => m.type === type).at(-1) as Extract<WebviewToHost, { type: T }>;

const requirementLines = () => panel.page.locator('#free-reqs li').allTextContents();

/** The nominal run and every corner of the design text with one parameter's literal replaced by hand. */
function analyzedWith(name: string, literal: string) {
  const edited = TEXT.replace(new RegExp(`(param ${name}\\s*=\\s*)[\\d.]+ ?\\w*`), `$1${literal}`);
  expect(edited).not.toBe(TEXT);
  const d = parseDocument(edited).designs[0]!;
  const models = [d.nominal!, ...d.corners.map((c) => c.model!)];
  return { nominal: d.nominal!, analyses: models.map((m) => analyzeDesign(m)) };
}

describe('free parameters in the panel', () => {
  it('shows a slider for every free parameter, within the bounds the file writes, instead of Cc and Rz', async () => {
    expect(written.map((w) => w.name)).toEqual(['id1', 'id2', 'cc', 'rz']);
    await show(hostData());
    expect(await panel.page.isVisible('#free')).toBe(true);
    expect(await panel.page.isVisible('#controls')).toBe(false);
    const names = await panel.page.locator('#free-sliders .slider-label').allTextContents();
    expect(names).toEqual(written.map((w) => w.name));
    const inputs = panel.page.locator('#free-sliders input[type="range"]');
    expect(await inputs.count()).toBe(4);
    // Each slider sits at the written value, and its ends are the bounds (Rz's lower bound 0: linear).
    const data = (await panel.page.evaluate(() => window.__ampnoteData))!;
    for (const [i, w] of written.entries()) {
      const slider = data.free!.sliders[i]!;
      expect(rel(slider.written, w.value)).toBeLessThan(1e-12);
      expect(slider.log).toBe(w.low > 0);
      expect(Number(await inputs.nth(i).inputValue())).toBe(freeValueToPosition(w.value, slider));
      expect(rel(freePositionToValue(0, slider), w.low)).toBeLessThan(1e-12);
      expect(rel(freePositionToValue(1000, slider), w.high)).toBeLessThan(1e-12);
    }
    for (const [i, w] of written.entries()) {
      await moveSlider(i, 1000);
      const sent = await lastPosted('free');
      expect(rel(sent.values[w.name]!, w.high)).toBeLessThan(1e-12);
      // The host answers before the next value is sent (the panel keeps one request in flight).
      await show(hostData(sent.values));
      await moveSlider(i, 0);
      const low = await lastPosted('free');
      expect(low.values[w.name]).toBeCloseTo(w.low, 20);
      await show(hostData(low.values));
    }
    await show(hostData());
    expect(await panel.page.getAttribute('#free-sliders input >> nth=3', 'aria-label')).toMatch(/linear/);
    await panel.page.screenshot({ path: join(OUTPUT, 'free-parameters.png'), fullPage: true });
    expect(panel.problems).toEqual([]);
    expect(await panel.page.evaluate(() => window.__violations)).toEqual([]);
  });

  it('shows the objective: the stages’ bias currents at the values shown', async () => {
    await show(hostData());
    // The example's stages state bias = 2 * id1 and bias = id2: 2 · 4 uA + 30 uA as written.
    const id1 = written[0]!.value;
    const id2 = written[1]!.value;
    const text = await panel.page.textContent('#free-objective');
    expect(text).toMatch(/bias currents/);
    const shown = Number(/([\d.]+) [uµ]A/.exec(text!)![1]) * 1e-6;
    expect(rel(shown, 2 * id1 + id2)).toBeLessThan(1e-9);
  });

  it('shows a written `minimize` expression and its value', async () => {
    const text = TEXT.replace(/^(\s*)require ugf/m, '$1minimize 2 * id1 + id2\n$1require ugf');
    const own = parseDocument(text).designs[0]!;
    const data = JSON.parse(
      JSON.stringify(buildPanelData(own.nominal!, URI, { source: own, free: { id2: 50e-6 } })),
    ) as PanelData;
    await show(data);
    // 2 · 4 uA + 50 uA, from the file's id1 and the slider's id2.
    const shown = (await panel.page.textContent('#free-objective'))!;
    expect(shown.startsWith('2 * id1 + id2: ')).toBe(true);
    expect(rel(Number(shown.slice('2 * id1 + id2: '.length)), 58e-6)).toBeLessThan(1e-3);
  });

  it('moves one slider: asks the host, redraws the charts and judges the requirements anew', async () => {
    await show(hostData());
    const before = await requirementLines();
    expect(before.length).toBe(4);
    const drawnBefore = await readCharts(panel.page);
    await panel.page.evaluate(() => (window.__posted.length = 0));
    // id1 from 4 uA to about 10 uA: more gm1 (UGF) and more tail current (slew).
    const slider = hostData().free!.sliders[0]!;
    const position = freeValueToPosition(10e-6, slider);
    await moveSlider(0, position);
    const sent = await lastPosted('free');
    const id1 = freePositionToValue(position, slider);
    expect(sent.values).toMatchObject({ id1, id2: written[1]!.value });
    expect(await panel.page.textContent('#free-sliders output >> nth=0')).toMatch(/A$/);

    await show(hostData(sent.values));
    const after = await requirementLines();
    expect(after).not.toEqual(before);
    // Against the engine on the file's text with id1's literal replaced by hand, in every corner.
    const hand = analyzedWith('id1', `${Number((id1 * 1e6).toPrecision(12))} uA`);
    const worstUgf = Math.min(...hand.analyses.map((a) => a.loop.ugfHz!));
    const ugfLine = after.find((l) => l.includes('unity-gain frequency'))!;
    expect(ugfLine.startsWith(worstUgf >= 4e6 ? 'pass' : 'FAIL')).toBe(true);
    expect(rel(Number(/worst ([\d.]+) MHz/.exec(ugfLine)![1]) * 1e6, worstUgf)).toBeLessThan(5e-3);
    // The charts now draw the edited design's poles.
    const drawn = await readCharts(panel.page);
    expect(drawn.splane).not.toEqual(drawnBefore.splane);
    const poles = drawn.splane
      .filter((d) => d.role === 'pole')
      .flatMap((d) => d.data.map((p) => Math.hypot(p.re!, p.im!) / (2 * Math.PI)))
      .sort((a, b) => a - b);
    const exact = hand.analyses[0]!.poles.map((p) => p.hz).sort((a, b) => a - b);
    expect(poles.length).toBe(exact.length);
    poles.forEach((hz, k) => expect(rel(hz, exact[k]!)).toBeLessThan(1e-9));
    expect(await panel.page.textContent('#free-objective')).toMatch(
      new RegExp(`${Number(((2 * id1 + written[1]!.value) * 1e6).toPrecision(3))} [uµ]A`),
    );
    expect(await panel.page.isEnabled('#free-apply')).toBe(true);
    await panel.page.screenshot({ path: join(OUTPUT, 'free-parameters-moved.png'), fullPage: true });

    // Apply sends the values shown; the edit is the host's (only the free parameters' literals).
    await panel.page.click('#free-apply');
    expect((await lastPosted('applyFree')).values).toEqual(sent.values);
    expect(panel.problems).toEqual([]);
  });

  it('refuses values that cannot be analysed and says why', async () => {
    const refused = hostData({ id2: 1 });
    expect(refused.free!.refused).toMatch(/id2 .* outside its bounds/);
    await panel.send({ type: 'data', data: refused });
    await panel.page.waitForFunction(() => /outside its bounds/.test(document.body.textContent ?? ''));
    expect(await panel.page.getAttribute('#free-status', 'class')).toMatch(/error/);
    // The written values stay shown, and there is nothing to write.
    expect(refused.free!.sliders.map((s) => s.value)).toEqual(written.map((w) => w.value));
    expect(await panel.page.isEnabled('#free-apply')).toBe(false);
  });

  it('solves: the sliders move to the answer and every requirement passes', async () => {
    await show(hostData());
    expect((await requirementLines()).some((l) => l.startsWith('FAIL'))).toBe(true);
    await panel.page.evaluate(() => (window.__posted.length = 0));
    await panel.page.click('#free-solve');
    expect(await lastPosted('solve')).toEqual({ type: 'solve' });
    // The host runs the solve and answers with the panel at its values, then the summary.
    const solve = solveDesign(source, { settings: DEFAULT_CHECK_SETTINGS });
    expect(solve.status).toBe('met');
    const values = Object.fromEntries(solve.values.map((v) => [v.name, v.after]));
    const solved = hostData(values);
    await show(solved);
    await panel.send({ type: 'status', text: 'solved' });
    const inputs = panel.page.locator('#free-sliders input[type="range"]');
    for (const [i, s] of solved.free!.sliders.entries()) {
      expect(s.value).toBe(values[s.name]);
      expect(Number(await inputs.nth(i).inputValue())).toBe(freeValueToPosition(s.value, s));
    }
    const lines = await requirementLines();
    expect(lines.length).toBe(4);
    expect(lines.every((l) => l.startsWith('pass'))).toBe(true);
    await panel.page.screenshot({ path: join(OUTPUT, 'free-parameters-solved.png'), fullPage: true });
    await panel.theme('light');
    await panel.page.screenshot({ path: join(OUTPUT, 'free-parameters-solved-light.png'), fullPage: true });
    await panel.theme('dark');
    expect(await panel.page.textContent('#caution')).toMatch(/Small-signal/);
    expect(panel.problems).toEqual([]);
  });

  it('fits a narrow panel beside the editor without sideways scrolling', async () => {
    const narrow = await openPanel(h, { width: 480, height: 1600 });
    const data = hostData();
    await narrow.send({ type: 'data', data });
    await narrow.page.waitForFunction(() => document.querySelectorAll('#free-reqs li').length === 4);
    const overflow = await narrow.page.evaluate(
      () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
    );
    expect(overflow).toBeLessThanOrEqual(0);
    expect(await narrow.page.locator('#free-sliders input[type="range"]').count()).toBe(4);
    await narrow.page.screenshot({ path: join(OUTPUT, 'free-parameters-narrow.png'), fullPage: true });
    expect(narrow.problems).toEqual([]);
    await narrow.page.close();
  });

  it('prints the time from a slider move to redrawn charts (a figure, not an assertion on time)', async () => {
    await show(hostData());
    const slider = hostData().free!.sliders[1]!;
    const engine: number[] = [];
    const page: number[] = [];
    for (let k = 0; k < 12; k++) {
      const position = 300 + 40 * k;
      await moveSlider(1, position);
      const sent = await lastPosted('free');
      const e0 = performance.now();
      const data = hostData(sent.values);
      engine.push(performance.now() - e0);
      // In the page: from the data's arrival to the end of the panel's handler, which renders the lists and
      // redraws every chart synchronously (a listener added after the panel's runs right after it).
      page.push(
        await panel.page.evaluate(
          (d) =>
            new Promise<number>((ok) => {
              const t0 = performance.now();
              const done = () => {
                window.removeEventListener('message', done);
                ok(performance.now() - t0);
              };
              window.addEventListener('message', done);
              window.postMessage({ type: 'data', data: d }, '*');
            }),
          data as unknown as Record<string, unknown>,
        ),
      );
      expect(await panel.page.evaluate(() => window.__ampnoteData?.free?.sliders[1]?.value)).toBe(
        freePositionToValue(position, slider),
      );
    }
    const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
    const total = engine.map((e, i) => e + page[i]!);
    console.log(
      `free-parameter slider move → redrawn charts (${source.name}: 4 free, nominal + 2 corners; ` +
        `${total.length} moves): median ${median(total).toFixed(1)} ms = engine ${median(engine).toFixed(1)} ms ` +
        `(edit, read, analyse every corner, panel data) + page ${median(page).toFixed(1)} ms (render, redraw); ` +
        `max ${Math.max(...total).toFixed(1)} ms; message transport not included`,
    );
  });
});
