// `ampnote report`: the self-contained page opened in headless Chromium — every chart drawn, nothing fetched.
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { formatDeg, formatHz } from '../../shared/src/format/si';
import { CAUTION } from '../../shared/src/protocol/panelData';
import { analyzeDocument } from '../../shared/src/service';
import { CHARTS as CHART_TABLE } from '../../shared/src/charts/descriptors';
import { parseDocument } from '../../shared/src/language';
import { panelSweeps } from '../../shared/src/panel/sweepPanel';
import { cli, ensureBuilt, FIXTURES, ROOT, tempDir } from './helpers';

/** The charts every analysable design has (the sweep charts are only for designs with sweeps). */
const ALWAYS = CHART_TABLE.filter((c) => !('onlyWhenPresent' in c && c.onlyWhenPresent));
const CHARTS = ALWAYS.map((c) => c.id);
let dir: ReturnType<typeof tempDir>;
let browser: Browser;

beforeAll(async () => {
  ensureBuilt();
  dir = tempDir('report');
  browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-quic',
      '--no-first-run',
      '--disable-sync',
    ],
  });
}, 300_000);

afterAll(async () => {
  await browser?.close();
  dir?.remove();
});

/** Writes the report of `file` into a fresh folder and returns the page opened from it, with every request seen. */
async function openReport(
  file: string,
  name: string,
): Promise<{ page: Page; url: string; requests: string[]; errors: string[]; html: string }> {
  const out = join(dir.path, name);
  mkdirSync(out);
  const r = cli(['report', file, '-o', 'report.html'], out);
  expect(r.stderr).toMatch(/^wrote report\.html \(1 file, \d+ designs?, /);
  expect([0, 1]).toContain(r.status);
  // Nothing but the requested file is written.
  expect(readdirSync(out)).toEqual(['report.html']);
  const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
  const requests: string[] = [];
  const errors: string[] = [];
  page.on('request', (req) => requests.push(req.url()));
  page.on('pageerror', (e) => errors.push(e.message));
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(m.text());
  });
  const url = pathToFileURL(join(out, 'report.html')).href;
  await page.goto(url);
  await page.waitForSelector('html[data-charts]', { timeout: 30_000 });
  return { page, url, requests, errors, html: readFileSync(join(out, 'report.html'), 'utf8') };
}

/** Pixels that differ from the canvas' own corner colour: a drawn chart has many, a blank one none. */
async function inkedPixels(page: Page, selector: string): Promise<number> {
  return page.$eval(selector, (el) => {
    const c = el as HTMLCanvasElement;
    const { data } = c.getContext('2d')!.getImageData(0, 0, c.width, c.height);
    let n = 0;
    for (let i = 0; i < data.length; i += 4) {
      if (
        Math.abs(data[i]! - data[0]!) +
          Math.abs(data[i + 1]! - data[1]!) +
          Math.abs(data[i + 2]! - data[2]!) >
        30
      )
        n++;
    }
    return n;
  });
}

describe('ampnote report', () => {
  it('draws all four charts of each design with no network request and no script error', async () => {
    const file = join(FIXTURES, 'marginal.ampnote');
    const { page, url, requests, errors, html } = await openReport(file, 'marginal');
    try {
      expect(await page.getAttribute('html', 'data-charts')).toBe('drawn');
      const drawn = await page.evaluate(() => {
        const r = (window as any).ampnoteReport;
        return {
          failed: r.failed,
          designs: r.drawn.map((d: any) => ({
            design: d.design,
            charts: Object.fromEntries(
              Object.entries(d.charts).map(([id, chart]: [string, any]) => [
                id,
                {
                  datasets: chart.data.datasets.length,
                  points: chart.data.datasets.reduce((n: number, ds: any) => n + ds.data.length, 0),
                  canvas: chart.canvas.id,
                },
              ]),
            ),
          })),
        };
      });
      expect(drawn.failed).toEqual([]);
      expect(drawn.designs.map((d: any) => d.design)).toEqual(['sense_amp']);
      for (const id of CHARTS) {
        const chart = drawn.designs[0].charts[id];
        expect(chart, id).toBeDefined();
        expect(chart.datasets, id).toBeGreaterThan(0);
        expect(chart.points, id).toBeGreaterThan(1);
        expect(chart.canvas).toBe(`chart-${id}-0`);
        // Chart.js animates in; poll until the canvas carries ink.
        await expect
          .poll(() => inkedPixels(page, `#chart-${id}-0`), { timeout: 10_000 })
          .toBeGreaterThan(2000);
      }
      // The figures carry the charts' titles from the one table the panel reads too.
      const captions = await page.$$eval('#design-0 figcaption strong', (els) =>
        els.map((e) => e.textContent),
      );
      expect(captions).toEqual(ALWAYS.map((c) => c.title));
      expect(errors).toEqual([]);
      expect(requests).toEqual([url]);
      // Kept for review (test-output/ is not committed).
      mkdirSync(join(ROOT, 'test-output'), { recursive: true });
      await page.screenshot({ path: join(ROOT, 'test-output', 'cli-report.png'), fullPage: true });
    } finally {
      await page.close();
    }
    // The page refers to nothing outside itself: no src/href but in-page anchors and data: URIs.
    const refs = [...html.matchAll(/\b(?:src|href)\s*=\s*"([^"]*)"/g)].map((m) => m[1]!);
    expect(refs.filter((r) => !r.startsWith('#') && !r.startsWith('data:'))).toEqual([]);
    expect(html).not.toMatch(/sourceMappingURL/);
    expect(html).toMatch(
      /<meta http-equiv="Content-Security-Policy" content="default-src &#39;none&#39;; script-src &#39;sha256-/,
    );
  });

  it('draws the sweep charts of a design with sweeps, one pair per sweep, from the sweep’s data', async () => {
    const text = readFileSync(join(ROOT, 'examples/twoStageLoadSweep.ampnote'), 'utf8').replace(
      'sweep cl from 1 pF to 1 nF',
      'sweep cl from 1 pF to 1 nF\n  sweep gm1 from 50 uS to 400 uS points 21',
    );
    const file = join(dir.path, 'twoSweeps.ampnote');
    writeFileSync(file, text);
    const sweeps = panelSweeps(parseDocument(text).designs[0]!)!;
    const { page, errors, requests, url } = await openReport(file, 'sweeps');
    try {
      expect(await page.getAttribute('html', 'data-charts')).toBe('drawn');
      const ids = await page.$$eval('canvas:not([data-sweep])', (els) => els.map((e) => e.id));
      // Every chart but those of a loop closed by its own elements, which this design is not.
      const shown = [...CHARTS, 'sweep-margins', 'sweep-locus'];
      expect(ids).toEqual(shown.map((c) => `chart-${c}-0`));
      // The second sweep's pair, in canvases of their own.
      expect(await page.$$eval('canvas[data-sweep="1"]', (els) => els.map((e) => e.dataset.chart))).toEqual([
        'sweep-margins',
        'sweep-locus',
      ]);
      // Each sweep's phase margins, as drawn, are the sweep's own (nominal corner, first dataset).
      const drawn = await page.evaluate(() =>
        (window as any).ampnoteReport.drawn.flatMap((d: any) =>
          Object.entries(d.charts)
            .filter(([id]) => id === 'sweep-margins')
            .map(([, c]: [string, any]) => c.data.datasets[0].data.map((p: any) => p.y)),
        ),
      );
      expect(drawn).toEqual(sweeps.map((s) => s.corners[0]!.phaseMarginDeg.map((v) => v ?? NaN)));
      for (const sel of ['#chart-sweep-margins-0', '#chart-sweep-locus-0', 'canvas[data-sweep="1"]'])
        await expect.poll(() => inkedPixels(page, sel), { timeout: 10_000 }).toBeGreaterThan(2000);
      const captions = await page.$$eval('#design-0 figcaption', (els) => els.map((e) => e.textContent));
      expect(captions.filter((c) => c!.includes('gm1 from 50 uS to 400 uS'))).toHaveLength(2);
      expect(errors).toEqual([]);
      expect(requests).toEqual([url]);
      await page
        .locator('#design-0 .charts')
        .screenshot({ path: join(ROOT, 'test-output', 'cli-report-sweeps.png') });
    } finally {
      await page.close();
    }
  });

  it('draws a closed circuit’s output impedance, load step and supply rejection, and a large-signal step', async () => {
    const { page, errors, requests, url } = await openReport(
      join(ROOT, 'examples/ldoSensorRail.ampnote'),
      'ldo',
    );
    try {
      expect(await page.getAttribute('html', 'data-charts')).toBe('drawn');
      for (const id of ['zout', 'load-step', 'supply-rejection'])
        await expect
          .poll(() => inkedPixels(page, `#chart-${id}-0`), { timeout: 10_000 })
          .toBeGreaterThan(2000);
      expect(errors).toEqual([]);
      expect(requests).toEqual([url]);
    } finally {
      await page.close();
    }
    const adc = await openReport(join(ROOT, 'examples/adcDriverSettling.ampnote'), 'adc');
    try {
      const roles = await adc.page.evaluate(() =>
        (window as any).ampnoteReport.drawn[0].charts.step.data.datasets.map((d: any) => d.role),
      );
      expect(roles).toContain('large-signal-step');
      expect(await adc.page.$$eval('canvas#chart-zout-0', (els) => els.length)).toBe(0);
    } finally {
      await adc.page.close();
    }
  });

  it('shows the engine values, the findings and the small-signal caution', async () => {
    const file = join(FIXTURES, 'marginal.ampnote');
    const report = analyzeDocument(readFileSync(file, 'utf8'));
    const nominal = report.designs[0]!.runs[0]!.analysis;
    const { page } = await openReport(file, 'values');
    try {
      const tiles = await page.$$eval('.tiles div', (els) =>
        Object.fromEntries(
          els.map((e) => [e.querySelector('dt')!.textContent, e.querySelector('dd')!.textContent]),
        ),
      );
      expect(tiles['Phase margin']).toBe(formatDeg(nominal.loop.phaseMarginDeg!));
      expect(tiles['Unity-gain frequency']).toBe(formatHz(nominal.loop.ugfHz!));
      const corners = await page.$$eval('table.corners thead th', (els) => els.map((e) => e.textContent));
      expect(corners).toEqual(['', ...report.designs[0]!.runs.map((r) => r.corner)]);
      const findings = await page.$$eval('.finding', (els) =>
        els.map((e) => [e.querySelector('.code')!.textContent, e.querySelector('p')!.textContent]),
      );
      expect(findings.sort()).toEqual(report.findings.map((f) => [f.code, f.message]).sort());
      const text = await page.textContent('body');
      expect(text).toContain(CAUTION);
      expect(await page.locator('.roots tbody tr').count()).toBe(nominal.poles.length + nominal.zeros.length);
      // Each other corner's roots, folded under its name.
      const others = report.designs[0]!.runs.slice(1);
      expect(
        await page.$$eval('.corner-roots summary strong', (els) => els.map((e) => e.textContent)),
      ).toEqual(others.map((r) => r.corner));
      for (const [k, run] of others.entries()) {
        expect(await page.locator('.corner-roots').nth(k).locator('tbody tr').count()).toBe(
          run.analysis.poles.length + run.analysis.zeros.length,
        );
      }
    } finally {
      await page.close();
    }
  });

  it('draws every design of a file with several, and gives the reason where a network cannot be solved', async () => {
    const many = await openReport(join(FIXTURES, 'broken.ampnote'), 'several');
    try {
      const drawn = await many.page.evaluate(() =>
        (window as any).ampnoteReport.drawn.map((d: any) => d.design),
      );
      expect(drawn).toEqual(['half_written', 'intact']);
      const ids = await many.page.$$eval('canvas', (els) => els.map((e) => e.id));
      expect(ids).toEqual([0, 1].flatMap((i) => CHARTS.map((c) => `chart-${c}-${i}`)));
      for (const id of ids)
        await expect.poll(() => inkedPixels(many.page, `#${id}`), { timeout: 10_000 }).toBeGreaterThan(2000);
      expect(await many.page.$$eval('.contents a', (els) => els.map((e) => e.textContent))).toEqual([
        'half_written',
        'intact',
      ]);
      expect(many.requests).toEqual([many.url]);
    } finally {
      await many.page.close();
    }
    const none = await openReport(join(FIXTURES, 'unsolvable.ampnote'), 'unsolvable');
    try {
      expect(await none.page.locator('canvas').count()).toBe(0);
      const problems = await none.page.$$eval('.problem', (els) => els.map((e) => e.textContent));
      expect(problems.some((p) => p?.includes("node 'x' has no DC path"))).toBe(true);
      expect(await none.page.textContent('.where')).toContain('not evaluated: corner typo');
      expect(none.errors).toEqual([]);
    } finally {
      await none.page.close();
    }
  });

  it('writes what the user typed as text, never as markup', async () => {
    const file = join(dir.path, 'markup.ampnote');
    writeFileSync(
      file,
      [
        '# Invented: markup typed into a design file must stay text in the report.',
        'design tagged',
        '  stage first   gm = 100 uS  rout = 1 Mohm  cap = 100 fF <img src=x onerror=alert(1)>',
        '  stage second  gm = 2 mS  rout = 100 kohm  cap = 200 fF  inverting',
        '  load cap = 1 pF',
        '  miller first -> second  cc = 1 pF  rz = 1 kohm',
        'end',
        '<script>document.title = "injected"</script>',
        '',
      ].join('\n'),
    );
    const { page, html } = await openReport(file, 'markup');
    try {
      expect(await page.locator('img').count()).toBe(0);
      expect(await page.title()).not.toBe('injected');
      // Only the page's own three scripts: the data, the chart bundle and the drawing code.
      expect(await page.locator('script').count()).toBe(3);
      const messages = await page.$$eval('.finding p', (els) => els.map((e) => e.textContent ?? ''));
      expect(messages.some((m) => m.includes('<'))).toBe(true);
      expect(await page.getAttribute('html', 'data-charts')).toBe('drawn');
    } finally {
      await page.close();
    }
    expect(html).not.toContain('<img');
    expect(html.match(/<script/g)).toHaveLength(3);
  });

  it('needs -o, and says so', () => {
    const r = cli(['report', join(FIXTURES, 'marginal.ampnote')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("'report' needs an output file");
  });
});
