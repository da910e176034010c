// The charts of results only some designs have, in the panel page with the real engine's data: the
// large-signal step beside the small-signal one (slewing shaded), and for a loop closed by its own
// elements the output impedance, the load step and the supply rejection.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { complex, multiply, divide, subtract, abs, type Complex as MComplex } from 'mathjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseDocument } from '../../shared/src/language';
import { analyzeDesign } from '../../shared/src/analysis';
import { buildPanelData } from '../../shared/src/panel/buildPanelData';
import type { PanelData } from '../../shared/src/protocol/panelData';
import type { Transfer } from '../../shared/src/analysis/types';
import { OUTPUT, ROOT, openPanel, startHarness, type Harness, type PanelPage } from './harness';

function load(file: string) {
  const text = readFileSync(join(ROOT, 'examples', file), 'utf8');
  const source = parseDocument(text).designs[0]!;
  const data = buildPanelData(source.nominal!, `file://${join(ROOT, 'examples', file)}`, { source });
  if (!data) throw new Error('no panel data');
  return { source, data: JSON.parse(JSON.stringify(data)) as PanelData };
}

/** |H(j2πf)| evaluated with mathjs' complex numbers: k·Π(jω − z)/Π(jω − p). */
function magnitudeMathjs(h: Transfer, hz: number): number {
  const s = complex(0, 2 * Math.PI * hz);
  let v: MComplex = complex(h.k, 0);
  for (const z of h.zeros) v = multiply(v, subtract(s, complex(z.re, z.im))) as MComplex;
  for (const p of h.poles) v = divide(v, subtract(s, complex(p.re, p.im))) as MComplex;
  return abs(v) as unknown as number;
}

type Drawn = { role: string; label: string; data: { x: number; y: number }[] }[];
const datasetsOf = (page: PanelPage['page'], id: string) =>
  page.evaluate(
    (id) =>
      (window as any).__ampnoteCharts[id].data.datasets.map((d: any) => ({
        role: d.role,
        label: d.label,
        data: d.data.map((p: any) => ({ x: p.x, y: p.y })),
      })),
    id,
  ) as Promise<Drawn>;

let h: Harness;
let panel: PanelPage;

beforeAll(async () => {
  h = await startHarness();
  panel = await openPanel(h);
});

afterAll(async () => {
  await h?.close();
});

describe('charts of results only some designs have', () => {
  it('draws the large-signal step per volt of its step beside the small-signal one, slewing shaded', async () => {
    const { source, data } = load('adcDriverSettling.ampnote');
    // Independently: the engine's own large-signal step for the written design.
    const l = analyzeDesign(source.nominal!).largeSignalStep!;
    expect(l).toBeDefined();
    const ls = data.step.largeSignal!;
    expect(ls.y).toEqual(l.samples.y.map((v) => v / l.amplitude));
    await panel.showData(data);
    const drawn = await datasetsOf(panel.page, 'step');
    const line = drawn.find((d) => d.role === 'large-signal-step')!;
    expect(line.data.map((p) => p.x)).toEqual(l.samples.t);
    expect(line.data.map((p) => p.y)).toEqual(ls.y);
    const spans = await panel.page.evaluate(
      () => (window as any).__ampnoteCharts.step.options.plugins.ampnoteSpans.ranges,
    );
    expect(spans).toEqual(l.slewing.map((r) => ({ from: r.start, to: r.end })));
    expect(spans.length).toBeGreaterThan(0);
    expect(await panel.page.textContent('#note-step')).toContain('Large-signal 1 V step');
    await panel.page.locator('#card-step').screenshot({ path: join(OUTPUT, 'step-large-signal.png') });
    // Not a loop closed by its own elements: those cards are left out.
    for (const id of ['zout', 'load-step', 'supply-rejection'])
      expect(await panel.page.isVisible(`#card-${id}`)).toBe(false);
    expect(panel.problems).toEqual([]);
  });

  it('draws the closed circuit’s output impedance, load step and supply rejection', async () => {
    const { source, data } = load('ldoSensorRail.ampnote');
    const c = analyzeDesign(source.nominal!).closedCircuit!;
    expect(c).toBeDefined();
    const cc = data.closedCircuit!;
    cc.hz.forEach((f, i) => {
      const want = magnitudeMathjs(c.outputImpedance, f);
      expect(Math.abs(cc.zoutOhm[i]! - want) / want).toBeLessThan(1e-9);
      c.supplies.forEach((s, k) => {
        const r = -20 * Math.log10(magnitudeMathjs(s.transfer, f));
        expect(Math.abs(cc.supplies[k]!.rejectionDb[i]! - r)).toBeLessThan(1e-6);
      });
    });
    // At the band's low end |Zout| approaches its DC value (the engine's own figure).
    expect(cc.zoutOhm[0]! / c.outputImpedance.dcOhm).toBeCloseTo(1, 1);
    await panel.showData(data);
    for (const id of ['zout', 'load-step', 'supply-rejection'])
      await panel.page.waitForFunction((id) => !!(window as any).__ampnoteCharts?.[id], id);
    expect((await datasetsOf(panel.page, 'zout'))[0]!.data.map((p) => p.y)).toEqual(cc.zoutOhm);
    expect((await datasetsOf(panel.page, 'load-step'))[0]!.data.map((p) => p.y)).toEqual(c.loadStep!.y);
    const supplies = await datasetsOf(panel.page, 'supply-rejection');
    expect(supplies.map((d) => d.label)).toEqual(c.supplies.map((s) => s.node));
    for (const id of ['zout', 'load-step', 'supply-rejection']) {
      expect(await panel.page.isVisible(`#card-${id}`)).toBe(true);
      await panel.page.locator(`#card-${id}`).screenshot({ path: join(OUTPUT, `circuit-${id}.png`) });
    }
    await panel.page.screenshot({ path: join(OUTPUT, 'circuit-panel.png'), fullPage: true });
    expect(panel.problems).toEqual([]);
  });
});
