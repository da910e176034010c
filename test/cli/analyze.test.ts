// `ampnote analyze`: JSON as documented in docs/cli.md, with the engine's numbers unchanged; the text tables.
import { closedLoopDcGain, loopBode } from '../../shared/src/analysis/closedLoopValues';
import { sensitivities, type Sensitivity } from '../../shared/src/solve/sensitivities';
import { readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { CornerRun } from '../../shared/src/report';
import { analyzeDocument } from '../../shared/src/service';
import { cli, ensureBuilt, FIXTURES, ROOT } from './helpers';
import { documentedPaths, matches, pathsOf, splitFindings } from './jsonShape';

const rel = (name: string) => relative(ROOT, join(FIXTURES, name));
const text = (name: string) => readFileSync(join(FIXTURES, name), 'utf8');
/** JSON has no infinities: the documented stand-in is null. */
const n = (x: number | undefined) => (x !== undefined && Number.isFinite(x) ? x : null);
const db = (vv: number) => n(20 * Math.log10(Math.abs(vv)));

/** What the docs promise for one corner, written out field by field from the engine's own result. */
function expectedCorner(run: CornerRun, moved: readonly Sensitivity[]) {
  const a = run.analysis;
  return {
    corner: run.corner,
    poles: a.poles.map((p) => ({
      re: n(p.s.re),
      im: n(p.s.im),
      hz: n(p.hz),
      damping: n(p.damping),
      namedAfter: p.namedAfter,
      participation: p.participation.map((x) => ({ node: x.node, share: n(x.share) })),
    })),
    zeros: a.zeros.map((z) => ({ re: n(z.s.re), im: n(z.s.im), hz: n(z.hz), rhp: z.rhp })),
    dcGain: { vv: n(a.dcGain), db: db(a.dcGain) },
    openLoopUgfHz: n(a.openLoopUgfHz),
    feedback:
      run.model.feedback.kind === 'node'
        ? { kind: 'node', node: run.model.feedback.node }
        : { kind: 'beta', beta: n(run.model.feedback.beta) },
    closedLoop: {
      stability: a.stability?.verdict ?? null,
      openLoopRhpPoles: a.stability?.openLoopRhpPoles ?? null,
      dcGain: (() => {
        const g = closedLoopDcGain(a);
        return g === undefined ? null : { vv: n(g), db: db(g) };
      })(),
      bandwidthHz: n(a.closedLoopBandwidthHz),
      poles: a.closedCircuit
        ? a.closedCircuit.poles.map((p) => ({
            re: n(p.s.re),
            im: n(p.s.im),
            hz: n(p.hz),
            damping: n(p.damping),
            namedAfter: p.namedAfter,
            participation: p.participation.map((x) => ({ node: x.node, share: n(x.share) })),
          }))
        : (a.closedLoopPoles ?? []).map((p) => {
            const m = Math.hypot(p.re, p.im);
            return {
              re: n(p.re),
              im: n(p.im),
              hz: n(m / (2 * Math.PI)),
              damping: n(m === 0 ? 1 : -p.re / m),
              namedAfter: null,
              participation: [],
            };
          }),
    },
    outputImpedance: a.closedCircuit
      ? {
          dcOhm: n(a.closedCircuit.outputImpedance.dcOhm),
          peakOhm: n(a.closedCircuit.outputImpedance.peakOhm),
          peakHz: n(a.closedCircuit.outputImpedance.peakHz),
        }
      : null,
    supplyRejection: (a.closedCircuit?.supplies ?? []).map((x) => ({
      node: x.node,
      dcDb: n(x.dcDb),
      worstDb: n(x.worstDb),
      worstHz: n(x.worstHz),
    })),
    loadStep: a.closedCircuit?.loadStep
      ? {
          peakDeviation: n(a.closedCircuit.loadStep.peakDeviation),
          settlingTime: n(a.closedCircuit.loadStep.settlingTime),
          final: n(a.closedCircuit.loadStep.final),
          tolerance: n(a.closedCircuit.loadStep.tolerance),
        }
      : null,
    bode: (() => {
      const b = loopBode(a);
      return b
        ? { frequencyHz: b.frequencyHz.map(n), loopMagDb: b.magDb.map(n), loopPhaseDeg: b.phaseDeg.map(n) }
        : null;
    })(),
    loop: {
      dcGain: { vv: n(a.loop.dcGain), db: db(a.loop.dcGain) },
      ugfHz: n(a.loop.ugfHz),
      lowestUgfHz: n(a.loop.lowestUgfHz),
      phaseMarginHz: n(a.loop.phaseMarginHz),
      phaseMarginDeg: n(a.loop.phaseMarginDeg),
      gainMarginDb: n(a.loop.gainMarginDb),
      phaseCrossoverHz: n(a.loop.phaseCrossoverHz),
      peakingDb: n(a.loop.peakingDb),
      crossings: a.loop.crossings.map((c) => ({
        hz: n(c.hz),
        direction: c.direction,
        phaseDeg: n(c.phaseDeg),
      })),
    },
    slew: a.slew
      ? {
          rate: n(a.slew.rate),
          limits: a.slew.limits.map((l) => ({
            stage: l.stage,
            current: n(l.current),
            cap: n(l.cap),
            rate: n(l.rate),
          })),
        }
      : null,
    settling: a.step
      ? {
          time: n(a.step.settlingTime),
          tolerance: n(a.step.tolerance),
          overshootPct: n(a.step.overshootPct),
          final: n(a.step.final),
        }
      : null,
    largeSignalStep: a.largeSignalStep
      ? {
          amplitude: n(a.largeSignalStep.amplitude),
          settlingTime: n(a.largeSignalStep.settlingTime),
          slewingTime: n(a.largeSignalStep.slewingTime),
          slewRateReached: n(a.largeSignalStep.slewRateReached),
          overshootPct: n(a.largeSignalStep.overshootPct),
          limitingStage: a.largeSignalStep.limitingStage ?? null,
          samples: { t: a.largeSignalStep.samples.t.map(n), y: a.largeSignalStep.samples.y.map(n) },
        }
      : null,
    hand: (a.hand ?? []).map((h) => ({
      quantity: h.quantity,
      formula: h.formula,
      hand: n(h.hand),
      exact: n(h.exact),
      relativeError: n(h.relativeError),
    })),
    problems: a.problems.map((p) => ({ message: p.message, node: p.node ?? null })),
    sensitivities: moved.map((x) => ({
      param: x.param,
      phaseMarginDeg: n(x.phaseMarginDeg),
      ugfRelative: n(x.ugfRelative),
      gainMarginDb: n(x.gainMarginDb),
      dcGainDb: n(x.dcGainDb),
    })),
  };
}

const FILES = [
  'marginal.ampnote',
  'clean.ampnote',
  'broken.ampnote',
  'unsolvable.ampnote',
  'largeSignal.ampnote',
  'circuitLoop.ampnote',
];
const outputs = new Map<string, any>();

beforeAll(() => {
  ensureBuilt();
  for (const name of FILES) {
    const r = cli(['analyze', rel(name), '--json']);
    expect(r.status, `${name}: ${r.stderr}`).toBe(
      name === 'clean.ampnote' || name === 'circuitLoop.ampnote' ? 0 : 1,
    );
    outputs.set(name, JSON.parse(r.stdout));
  }
}, 300_000);

describe('analyze --json', () => {
  it('has exactly the fields docs/cli.md documents, and every documented field occurs', () => {
    const top = documentedPaths('#### Fields of `analyze --json`');
    const finding = documentedPaths('A _finding_');
    expect(top.length).toBeGreaterThan(50);
    const seen = new Set<string>();
    const seenFinding = new Set<string>();
    for (const [name, json] of outputs) {
      const { own, finding: inFindings } = splitFindings(pathsOf(json), [
        'designs[].findings[]',
        'findings[]',
      ]);
      for (const p of own) {
        expect(
          top.some((d) => matches(d, p)),
          `${name}: ${p} is not documented`,
        ).toBe(true);
        for (const d of top) if (matches(d, p)) seen.add(d);
      }
      for (const p of inFindings) {
        expect(
          finding.some((d) => matches(d, p)),
          `${name}: finding field ${p} is not documented`,
        ).toBe(true);
        for (const d of finding) if (matches(d, p)) seenFinding.add(d);
      }
    }
    expect(top.filter((d) => !seen.has(d))).toEqual([]);
    expect(finding.filter((d) => !seenFinding.has(d))).toEqual([]);
  });

  it('copies the engine numbers unchanged for every design and corner', () => {
    for (const name of FILES) {
      const report = analyzeDocument(text(name));
      const json = outputs.get(name);
      expect(json.schemaVersion).toBe(1);
      expect(json.file).toBe(rel(name));
      expect(json.designs.map((d: any) => d.name)).toEqual(report.designs.map((d) => d.source.name));
      report.designs.forEach((d, i) => {
        const got = json.designs[i];
        expect(got.range).toEqual(d.source.range);
        const moved = sensitivities(d.source, d.runs);
        expect(got.corners).toEqual(
          d.runs.map((r) =>
            expectedCorner(
              r,
              moved.filter((x) => x.corner === r.corner),
            ),
          ),
        );
        const w = d.worst;
        const worst = (x?: { value: number; corner: string }) =>
          x ? { value: n(x.value), corner: x.corner } : null;
        expect(got.worst).toEqual({
          phaseMarginDeg: worst(w.phaseMarginDeg),
          ugfHz: worst(w.ugfHz),
          gainMarginDb: worst(w.gainMarginDb),
          slew: worst(w.slew),
          settlingTime: worst(w.settlingTime),
          dcGainDb: worst(w.dcGainDb),
        });
        const own = report.findings.filter((f) => f.design === d.source.name);
        expect(got.findings.map((f: any) => [f.code, f.message, f.range])).toEqual(
          own
            .slice()
            .sort(
              (a, b) =>
                a.range.start.line - b.range.start.line || a.range.start.character - b.range.start.character,
            )
            .map((f) => [f.code, f.message, f.range]),
        );
      });
    }
  });

  it('gives the DC gain and poles of the two-stage fixture as the closed forms say', () => {
    const nominal = outputs.get('marginal.ampnote').designs[0].corners[0];
    // DC gain of two cascaded gm stages, −gm1·R1·gm2·(R2 ∥ RL) (GHLM ch. 9, from memory):
    // 120 uS · 1.2 Mohm · 480 uS · (250 kohm ∥ 1 Mohm = 200 kohm) = 144 · 96 = 13824 V/V, inverting.
    expect(nominal.dcGain.vv).toBeCloseTo(-13824, 6);
    expect(nominal.dcGain.db).toBeCloseTo(20 * Math.log10(13824), 9);
    // Poles are the roots of D(s) = 1 + a1·s + a2·s² with a1 = (C1+Cc)R1 + (C2+Cc)R2 + gm2R1R2Cc and
    // a2 = R1R2(C1C2 + Cc(C1+C2)) (GHLM ch. 9, from memory; re-derived), C2 including the load.
    const [gm2, R1, R2, C1, C2, Cc] = [480e-6, 1.2e6, 2e5, 120e-15, 180e-15 + 1.5e-12, 0.8e-12];
    const a1 = (C1 + Cc) * R1 + (C2 + Cc) * R2 + gm2 * R1 * R2 * Cc;
    const a2 = R1 * R2 * (C1 * C2 + Cc * (C1 + C2));
    const disc = Math.sqrt(a1 * a1 - 4 * a2);
    const roots = [(-a1 + disc) / (2 * a2), (-a1 - disc) / (2 * a2)];
    const poles = nominal.poles.map((p: any) => p.re).sort((a: number, b: number) => b - a);
    expect(poles).toHaveLength(2);
    expect(poles[0] / roots[0]!).toBeCloseTo(1, 9);
    expect(poles[1] / roots[1]!).toBeCloseTo(1, 9);
    // and the zero at +gm2/Cc
    expect(nominal.zeros).toHaveLength(1);
    expect(nominal.zeros[0].re / (gm2 / Cc)).toBeCloseTo(1, 9);
    expect(nominal.zeros[0].rhp).toBe(true);
  });

  it('reports the unsolved network and the corner that could not be evaluated', () => {
    const d = outputs.get('unsolvable.ampnote').designs[0];
    expect(d.corners).toHaveLength(1);
    expect(d.corners[0].problems[0]).toMatchObject({ node: 'x' });
    expect(d.corners[0].poles).toEqual([]);
    expect(d.unevaluatedCorners).toEqual(['typo']);
  });

  it('keeps file-level findings apart from the designs', () => {
    const json = outputs.get('broken.ampnote');
    expect(json.designs.map((d: any) => d.name)).toEqual(['half_written', 'intact']);
    expect(json.designs[0].findings.some((f: any) => f.code === 'syntax' && f.location.line === 4)).toBe(
      true,
    );
    expect(json.designs[1].findings.every((f: any) => f.code !== 'syntax')).toBe(true);
  });
});

describe('analyze, other cases', () => {
  it('--design picks one design, and an unknown name is a usage error listing the names', () => {
    const one = JSON.parse(cli(['analyze', rel('broken.ampnote'), '--json', '--design', 'intact']).stdout);
    expect(one.designs.map((d: any) => d.name)).toEqual(['intact']);
    const r = cli(['analyze', rel('broken.ampnote'), '--design', 'nope']);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('no design named "nope" (this file has: half_written, intact)');
  });

  it('prints readable tables with every corner, the worst case, the findings and the caution', () => {
    const r = cli(['analyze', rel('marginal.ampnote')]);
    expect(r.status).toBe(1);
    const lines = r.stdout.split('\n');
    expect(lines[0]).toBe(`sense_amp  (${rel('marginal.ampnote')}:4)`);
    expect(lines[2]).toMatch(/^\s+nominal\s+heavy$/);
    const pm = lines.find((l) => l.trimStart().startsWith('phase margin'))!;
    const json = outputs.get('marginal.ampnote').designs[0];
    // One decimal, as the editor shows degrees.
    expect(pm.split(/\s{2,}/).slice(2)).toEqual(
      json.corners.map((c: any) => `${c.loop.phaseMarginDeg.toFixed(1)}°`),
    );
    expect(r.stdout).toContain(
      `worst case: phase margin ${json.worst.phaseMarginDeg.value.toFixed(1)}° (${json.worst.phaseMarginDeg.corner})`,
    );
    expect(r.stdout).toMatch(new RegExp(`^    ${rel('marginal.ampnote')}:12:3: error rhp-zero: `, 'm'));
    expect(r.stdout).toContain('Small-signal, linear estimates at one operating point.');
  });

  it('is a usage error for a missing file or a file without designs', () => {
    const missing = cli(['analyze', 'nowhere.ampnote', '--json']);
    expect(missing.status).toBe(2);
    expect(missing.stdout).toBe('');
    expect(missing.stderr).toBe('nowhere.ampnote: error: no such file or folder\n');
    const empty = cli(['analyze', 'package.json']);
    expect(empty.status).toBe(2);
    expect(empty.stderr).toContain('package.json: error: no design in this file');
  });
});
