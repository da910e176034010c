// The sweep charts in the panel page (headless Chromium), fed with PanelData from the real engine: the
// margins drawn per corner are the sweep's numbers, the requirement sits at the written value, the
// failing stretches are the judged ones, the locus tracks pass through the roots of single analyses, hover
// names the swept value, and the selector switches between a design's sweeps.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseDocument } from '../../shared/src/language';
import { buildPanelData } from '../../shared/src/panel/buildPanelData';
import type { PanelData } from '../../shared/src/protocol/panelData';
import { symlog } from '../../shared/src/charts/symlog';
import { sweepLocusKnee } from '../../shared/src/charts/sweepCharts';
import { OUTPUT, ROOT, openPanel, readCharts, startHarness, type Harness, type PanelPage } from './harness';

function panelOf(text: string, uri: string): PanelData {
  const source = parseDocument(text).designs[0]!;
  const d = buildPanelData(source.nominal!, uri, { source });
  if (!d) throw new Error('no panel data');
  // As the server sends it: JSON, where a value not computed is null.
  return JSON.parse(JSON.stringify(d)) as PanelData;
}

const exampleText = readFileSync(join(ROOT, 'examples/twoStageLoadSweep.ampnote'), 'utf8');
const exampleUri = `file://${join(ROOT, 'examples/twoStageLoadSweep.ampnote')}`;

let h: Harness;
let panel: PanelPage;

beforeAll(async () => {
  h = await startHarness();
  panel = await openPanel(h);
});

afterAll(async () => {
  await h?.close();
});

describe('sweep charts', () => {
  it('draw each corner’s margins, the requirement and the failing stretch from the sweep', async () => {
    const data = panelOf(exampleText, exampleUri);
    const sw = data.sweeps![0]!;
    await panel.showData(data);
    await panel.page.waitForFunction(() => !!(window as any).__ampnoteCharts?.['sweep-margins']);
    expect(await panel.page.isVisible('#card-sweep-margins')).toBe(true);
    const drawn = (await readCharts(panel.page)) as unknown as Record<
      string,
      { role: string; label: string; data: { x: number; y: number | null }[] }[]
    >;
    const pm = drawn['sweep-margins']!.filter((d) => d.role === 'sweep-pm');
    expect(pm.map((d) => d.label)).toEqual(sw.corners.map((c) => `PM ${c.corner}`));
    pm.forEach((d, c) => {
      expect(d.data.map((p) => p.x)).toEqual(sw.values);
      expect(d.data.map((p) => p.y)).toEqual(sw.corners[c]!.phaseMarginDeg);
    });
    // The written requirement `require pm >= 50 deg` is the line drawn.
    const req = drawn['sweep-margins']!.find(
      (d) => d.role === 'sweep-requirement' && d.label.startsWith('PM'),
    )!;
    expect(req.data.map((p) => p.y)).toEqual([50, 50]);
    // The example fails over the middle of its range (its own comment says so): shaded there.
    const shade = await panel.page.evaluate(
      () => (window as any).__ampnoteCharts['sweep-margins'].options.plugins.ampnoteSpans.ranges,
    );
    expect(shade).toEqual(sw.failing.map((f) => ({ from: f.from, to: f.to, label: f.label })));
    expect(shade.length).toBeGreaterThan(0);
    expect(shade[0].from).toBeGreaterThan(sw.values[0]!);
    expect(shade[0].to).toBeLessThan(sw.values.at(-1)!);
    await panel.page.locator('#card-sweep-margins').screenshot({ path: join(OUTPUT, 'sweep-margins.png') });
    expect(panel.problems).toEqual([]);
  });

  it('shows the values at the hovered swept value', async () => {
    const data = panelOf(exampleText, exampleUri);
    await panel.showData(data);
    const sw = data.sweeps![0]!;
    const i = 30;
    const at = await panel.page.evaluate((i) => {
      const c = (window as any).__ampnoteCharts['sweep-margins'];
      const ds = c.data.datasets.findIndex((d: { role: string }) => d.role === 'sweep-pm');
      const el = c.getDatasetMeta(ds).data[i];
      const box = c.canvas.getBoundingClientRect();
      return { x: box.left + el.x, y: box.top + el.y };
    }, i);
    await panel.page.mouse.move(at.x, at.y);
    const lines = await panel.page.waitForFunction(() => {
      const c = (window as any).__ampnoteCharts['sweep-margins'];
      const t = c.tooltip;
      return t?.opacity > 0 ? [t.title, ...t.body.flatMap((b: { lines: string[] }) => b.lines)] : undefined;
    });
    const text = ((await lines.jsonValue()) as string[]).flat().join('\n');
    expect(text).toContain('cl = ');
    for (const c of sw.corners) expect(text).toContain(`${c.corner}: PM ${c.phaseMarginDeg[i]!.toFixed(1)}°`);
    await panel.page
      .locator('#card-sweep-margins')
      .screenshot({ path: join(OUTPUT, 'sweep-margins-hover.png') });
    await panel.page.mouse.move(1, 1);
  });

  it('draws the poles and zeros along the sweep where the engine put them', async () => {
    const data = panelOf(exampleText, exampleUri);
    await panel.showData(data);
    const sw = data.sweeps![0]!;
    const drawn = (await readCharts(panel.page)) as unknown as Record<
      string,
      { role: string; data: { x: number; y: number; re: number; im: number; swept: number }[] }[]
    >;
    const tracks = drawn['sweep-locus']!.filter((d) => d.role === 'sweep-pole-track');
    expect(tracks.length).toBe(sw.locus.filter((t) => t.kind === 'pole').length);
    const v0 = sweepLocusKnee(sw);
    const first = sw.locus.find((t) => t.kind === 'pole')!;
    tracks[0]!.data.forEach((p, i) => {
      expect(p.re).toBe(first.s[i]!.re);
      expect(p.x).toBeCloseTo(symlog(first.s[i]!.re, v0), 12);
      expect(p.swept).toBe(first.values[i]);
    });
    await panel.page.locator('#card-sweep-locus').screenshot({ path: join(OUTPUT, 'sweep-locus.png') });
  });

  it('exports the shown sweep as CSV: one row per corner and value, the values the chart draws', async () => {
    const data = panelOf(exampleText, exampleUri);
    const sw = data.sweeps![0]!;
    await panel.showData(data);
    await panel.page.evaluate(() => (window.__posted.length = 0));
    await panel.page.click('#card-sweep-margins button[data-action="csv"]');
    const posted = await panel.posted();
    const csv = (posted.find((m) => m.type === 'exportCsv') as { csv: string }).csv.trim().split('\n');
    expect(csv[0]).toBe('corner,swept_value_SI,phase_margin_deg,ugf_Hz,gain_margin_dB');
    expect(csv).toHaveLength(1 + sw.corners.length * sw.values.length);
    const row = csv[1 + sw.values.length + 7]!.split(',');
    const slow = sw.corners[1]!;
    expect(row[0]).toBe(slow.corner);
    expect(Number(row[1])).toBe(sw.values[7]);
    expect(Number(row[2])).toBe(slow.phaseMarginDeg[7]);
    expect(Number(row[3])).toBe(slow.ugfHz[7]);
  });

  it('switches between a design’s sweeps with the selector, and leaves the cards out without a sweep', async () => {
    const two = exampleText.replace(
      'sweep cl from 1 pF to 1 nF',
      'sweep cl from 1 pF to 1 nF\n  sweep gm1 from 50 uS to 400 uS points 21',
    );
    const data = panelOf(two, exampleUri);
    expect(data.sweeps!.map((s) => s.param)).toEqual(['cl', 'gm1']);
    await panel.showData(data);
    expect(await panel.page.isVisible('#sweep-select')).toBe(true);
    await panel.page.selectOption('#sweep-select', '1');
    await panel.page.waitForFunction(() => {
      const c = (window as any).__ampnoteCharts['sweep-margins'];
      return c.data.datasets[0].data.length === 21;
    });
    const xs = await panel.page.evaluate(() =>
      (window as any).__ampnoteCharts['sweep-margins'].data.datasets[0].data.map((p: { x: number }) => p.x),
    );
    expect(xs).toEqual(data.sweeps![1]!.values);
    await panel.page.screenshot({ path: join(OUTPUT, 'sweep-selector.png'), fullPage: true });

    const plain = panelOf(exampleText.replace(/\n\s*sweep cl .*\n/, '\n'), exampleUri);
    expect(plain.sweeps).toBeUndefined();
    await panel.showData({ ...plain, design: 'no_sweep' });
    expect(await panel.page.isVisible('#card-sweep-margins')).toBe(false);
    expect(await panel.page.isVisible('#card-sweep-locus')).toBe(false);
    expect(await panel.page.evaluate(() => Object.keys((window as any).__ampnoteCharts))).not.toContain(
      'sweep-margins',
    );
    expect(panel.problems).toEqual([]);
  });
});
