// `analyze --json`: the engine's numbers per design and corner, as documented in docs/cli.md (schemaVersion 1).
// Values are copied as the engine computed them; the only derived numbers are gains in dB (20·log10|V/V|).
// JSON has no Infinity or NaN: such a value is written as null.
import { sensitivities, type Sensitivity } from '../../shared/src/solve/sensitivities';
import type { CheckSettings } from '../../shared/src/checks/settings';
import type { Finding } from '../../shared/src/checks/types';
import type { CornerRun, DesignReport, DocumentReport, Worst, WorstCase } from '../../shared/src/report';
import { CAUTION } from '../../shared/src/protocol/panelData';
import { findingJson, placeJson, SCHEMA_VERSION, type FindingJson, type PlaceJson } from './formatJson';
import { findingsOfDesign, sortedFindings } from './run';
import { gainDb } from '../../shared/src/units';
import { dampingRatio, modulusHz } from '../../shared/src/numeric/complex';
import { closedLoopDcGain, loopBode } from '../../shared/src/analysis/closedLoopValues';
import type { Pole } from '../../shared/src/analysis/types';

type Num = number | null;

export interface GainJson {
  readonly vv: Num;
  readonly db: Num;
}

export interface CornerJson {
  readonly corner: string;
  readonly poles: readonly {
    readonly re: Num;
    readonly im: Num;
    readonly hz: Num;
    readonly damping: Num;
    readonly namedAfter: string;
    readonly participation: readonly { readonly node: string; readonly share: Num }[];
  }[];
  readonly zeros: readonly { readonly re: Num; readonly im: Num; readonly hz: Num; readonly rhp: boolean }[];
  readonly dcGain: GainJson;
  readonly openLoopUgfHz: Num;
  /** How the loop is closed: by a factor (`feedback beta`), or by the circuit at a node (`feedback at`). */
  readonly feedback:
    { readonly kind: 'beta'; readonly beta: Num } | { readonly kind: 'node'; readonly node: string };
  /** The closed loop's own poles and the stability verdict they give (null verdict: not computed). */
  readonly closedLoop: {
    readonly stability: 'stable' | 'unstable' | 'marginal' | null;
    /** Right-half-plane poles of the open loop: when > 0, Bode margins do not decide stability. */
    readonly openLoopRhpPoles: number | null;
    /** DC gain from `in` to the output of the closed loop. */
    readonly dcGain: GainJson | null;
    /** −3 dB frequency of the closed loop from `in` to the output, relative to its DC gain. */
    readonly bandwidthHz: Num;
    readonly poles: readonly {
      readonly re: Num;
      readonly im: Num;
      readonly hz: Num;
      readonly damping: Num;
      /** For a loop written as a circuit: the node holding ≥ 80 % of the pole, or `shared`; else null. */
      readonly namedAfter: string | null;
      readonly participation: readonly { readonly node: string; readonly share: Num }[];
    }[];
  };
  /** The closed circuit's output impedance (`feedback at` designs; else null). */
  readonly outputImpedance: { readonly dcOhm: Num; readonly peakOhm: Num; readonly peakHz: Num } | null;
  /** Per `supply` (`feedback at` designs): rejection −20·log10|v(out)/v(supply)| in dB. */
  readonly supplyRejection: readonly {
    readonly node: string;
    readonly dcDb: Num;
    readonly worstDb: Num;
    readonly worstHz: Num;
  }[];
  /** Output deviation per ampere of a load-current step drawn from the output (`feedback at` designs). */
  readonly loadStep: {
    readonly peakDeviation: Num;
    readonly settlingTime: Num;
    readonly final: Num;
    readonly tolerance: Num;
  } | null;
  /** The loop gain on the documented grid (10 points per decade, decade-aligned, around its roots). */
  readonly bode: {
    readonly frequencyHz: readonly Num[];
    readonly loopMagDb: readonly Num[];
    readonly loopPhaseDeg: readonly Num[];
  } | null;
  readonly loop: {
    readonly dcGain: GainJson;
    readonly ugfHz: Num;
    /** The lowest downward 0 dB crossing (equal to ugfHz unless the loop gain crosses 0 dB several times). */
    readonly lowestUgfHz: Num;
    /** Where the phase margin is read: the crossing with the smallest margin. */
    readonly phaseMarginHz: Num;
    readonly phaseMarginDeg: Num;
    readonly gainMarginDb: Num;
    readonly phaseCrossoverHz: Num;
    readonly peakingDb: Num;
    readonly crossings: readonly {
      readonly hz: Num;
      readonly direction: 'down' | 'up';
      readonly phaseDeg: Num;
    }[];
  };
  readonly slew: {
    readonly rate: Num;
    readonly limits: readonly {
      readonly stage: string;
      readonly current: Num;
      readonly cap: Num;
      readonly rate: Num;
    }[];
  } | null;
  readonly settling: {
    readonly time: Num;
    readonly tolerance: Num;
    readonly overshootPct: Num;
    readonly final: Num;
  } | null;
  /** The large-signal step a `settle … step` requirement asks for; null when none does. */
  readonly largeSignalStep: {
    readonly amplitude: Num;
    readonly settlingTime: Num;
    readonly slewingTime: Num;
    readonly slewRateReached: Num;
    readonly overshootPct: Num;
    readonly limitingStage: string | null;
    readonly samples: { readonly t: readonly Num[]; readonly y: readonly Num[] };
  } | null;
  readonly hand: readonly {
    readonly quantity: string;
    readonly formula: string;
    readonly hand: Num;
    readonly exact: Num;
    readonly relativeError: Num;
  }[];
  readonly problems: readonly { readonly message: string; readonly node: string | null }[];
  /** For each parameter written as a literal: the change of the loop for a +10 % step of it. */
  readonly sensitivities: readonly SensitivityJson[];
}

export interface SensitivityJson {
  readonly param: string;
  readonly phaseMarginDeg: Num;
  /** Relative change of the UGF (0.05 = +5 %). */
  readonly ugfRelative: Num;
  readonly gainMarginDb: Num;
  readonly dcGainDb: Num;
}

export interface WorstJson {
  readonly phaseMarginDeg: WorstValueJson | null;
  readonly ugfHz: WorstValueJson | null;
  readonly gainMarginDb: WorstValueJson | null;
  readonly slew: WorstValueJson | null;
  readonly settlingTime: WorstValueJson | null;
  readonly dcGainDb: WorstValueJson | null;
}
export interface WorstValueJson {
  readonly value: Num;
  readonly corner: string;
}

export interface DesignJson extends PlaceJson {
  readonly name: string;
  /** Nominal first, then each corner that evaluated. */
  readonly corners: readonly CornerJson[];
  /** Corners written in the file whose overrides could not be evaluated (their errors are findings). */
  readonly unevaluatedCorners: readonly string[];
  readonly worst: WorstJson;
  readonly findings: readonly FindingJson[];
}

export interface AnalyzeJson {
  readonly schemaVersion: typeof SCHEMA_VERSION;
  readonly tool: { readonly name: 'ampnote'; readonly version: string };
  readonly file: string;
  readonly caution: string;
  readonly settings: CheckSettings;
  readonly designs: readonly DesignJson[];
  /** Findings outside every design (e.g. a syntax error between designs). */
  readonly findings: readonly FindingJson[];
}

const num = (x: number | undefined): Num => (x !== undefined && Number.isFinite(x) ? x : null);
const db = (vv: number): Num => num(gainDb(vv));
const gain = (vv: number): GainJson => ({ vv: num(vv), db: db(vv) });

/** Per corner: what +10 % of each literal parameter changes (see solve/sensitivities.ts). */
function sensitivityJson(list: readonly Sensitivity[]): SensitivityJson[] {
  return list.map((x) => ({
    param: x.param,
    phaseMarginDeg: num(x.phaseMarginDeg),
    ugfRelative: num(x.ugfRelative),
    gainMarginDb: num(x.gainMarginDb),
    dcGainDb: num(x.dcGainDb),
  }));
}

/** A pole with the nodes that take part in it, as `poles[]` and a circuit's `closedLoop.poles[]` show it. */
function poleJson(p: Pole) {
  return {
    re: num(p.s.re),
    im: num(p.s.im),
    hz: num(p.hz),
    damping: num(p.damping),
    namedAfter: p.namedAfter,
    participation: p.participation.map((x) => ({ node: x.node, share: num(x.share) })),
  };
}

export function cornerJson(run: CornerRun, moved: readonly Sensitivity[] = []): CornerJson {
  const a = run.analysis;
  return {
    corner: run.corner,
    poles: a.poles.map(poleJson),
    zeros: a.zeros.map((z) => ({ re: num(z.s.re), im: num(z.s.im), hz: num(z.hz), rhp: z.rhp })),
    dcGain: gain(a.dcGain),
    openLoopUgfHz: num(a.openLoopUgfHz),
    feedback:
      run.model.feedback.kind === 'node'
        ? { kind: 'node', node: run.model.feedback.node }
        : { kind: 'beta', beta: num(run.model.feedback.beta) },
    closedLoop: {
      stability: a.stability?.verdict ?? null,
      openLoopRhpPoles: a.stability?.openLoopRhpPoles ?? null,
      dcGain: (() => {
        const g = closedLoopDcGain(a);
        return g === undefined ? null : gain(g);
      })(),
      bandwidthHz: num(a.closedLoopBandwidthHz),
      poles: a.closedCircuit
        ? a.closedCircuit.poles.map(poleJson)
        : (a.closedLoopPoles ?? []).map((p) => ({
            re: num(p.re),
            im: num(p.im),
            hz: num(modulusHz(p)),
            damping: num(dampingRatio(p)),
            namedAfter: null,
            participation: [],
          })),
    },
    outputImpedance: a.closedCircuit
      ? {
          dcOhm: num(a.closedCircuit.outputImpedance.dcOhm),
          peakOhm: num(a.closedCircuit.outputImpedance.peakOhm),
          peakHz: num(a.closedCircuit.outputImpedance.peakHz),
        }
      : null,
    supplyRejection: (a.closedCircuit?.supplies ?? []).map((s) => ({
      node: s.node,
      dcDb: num(s.dcDb),
      worstDb: num(s.worstDb),
      worstHz: num(s.worstHz),
    })),
    loadStep: a.closedCircuit?.loadStep
      ? {
          peakDeviation: num(a.closedCircuit.loadStep.peakDeviation),
          settlingTime: num(a.closedCircuit.loadStep.settlingTime),
          final: num(a.closedCircuit.loadStep.final),
          tolerance: num(a.closedCircuit.loadStep.tolerance),
        }
      : null,
    bode: (() => {
      const b = loopBode(a);
      return b
        ? {
            frequencyHz: b.frequencyHz.map(num),
            loopMagDb: b.magDb.map(num),
            loopPhaseDeg: b.phaseDeg.map(num),
          }
        : null;
    })(),
    loop: {
      dcGain: gain(a.loop.dcGain),
      ugfHz: num(a.loop.ugfHz),
      lowestUgfHz: num(a.loop.lowestUgfHz),
      phaseMarginHz: num(a.loop.phaseMarginHz),
      phaseMarginDeg: num(a.loop.phaseMarginDeg),
      gainMarginDb: num(a.loop.gainMarginDb),
      phaseCrossoverHz: num(a.loop.phaseCrossoverHz),
      peakingDb: num(a.loop.peakingDb),
      crossings: a.loop.crossings.map((c) => ({
        hz: num(c.hz),
        direction: c.direction,
        phaseDeg: num(c.phaseDeg),
      })),
    },
    slew: a.slew
      ? {
          rate: num(a.slew.rate),
          limits: a.slew.limits.map((l) => ({
            stage: l.stage,
            current: num(l.current),
            cap: num(l.cap),
            rate: num(l.rate),
          })),
        }
      : null,
    settling: a.step
      ? {
          time: num(a.step.settlingTime),
          tolerance: num(a.step.tolerance),
          overshootPct: num(a.step.overshootPct),
          final: num(a.step.final),
        }
      : null,
    largeSignalStep: a.largeSignalStep
      ? {
          amplitude: num(a.largeSignalStep.amplitude),
          settlingTime: num(a.largeSignalStep.settlingTime),
          slewingTime: num(a.largeSignalStep.slewingTime),
          slewRateReached: num(a.largeSignalStep.slewRateReached),
          overshootPct: num(a.largeSignalStep.overshootPct),
          limitingStage: a.largeSignalStep.limitingStage ?? null,
          samples: { t: a.largeSignalStep.samples.t.map(num), y: a.largeSignalStep.samples.y.map(num) },
        }
      : null,
    hand: (a.hand ?? []).map((h) => ({
      quantity: h.quantity,
      formula: h.formula,
      hand: num(h.hand),
      exact: num(h.exact),
      relativeError: num(h.relativeError),
    })),
    problems: a.problems.map((p) => ({ message: p.message, node: p.node ?? null })),
    sensitivities: sensitivityJson(moved),
  };
}

function worstJson(w: WorstCase): WorstJson {
  const one = (x: Worst | undefined): WorstValueJson | null =>
    x ? { value: num(x.value), corner: x.corner } : null;
  return {
    phaseMarginDeg: one(w.phaseMarginDeg),
    ugfHz: one(w.ugfHz),
    gainMarginDb: one(w.gainMarginDb),
    slew: one(w.slew),
    settlingTime: one(w.settlingTime),
    dcGainDb: one(w.dcGainDb),
  };
}

export function designJson(d: DesignReport, findings: readonly Finding[]): DesignJson {
  const evaluated = new Set(d.runs.map((r) => r.corner));
  return {
    name: d.source.name,
    ...placeJson(d.source.range),
    corners: (() => {
      const moved = sensitivities(d.source, d.runs);
      return d.runs.map((run) =>
        cornerJson(
          run,
          moved.filter((x) => x.corner === run.corner),
        ),
      );
    })(),
    unevaluatedCorners: d.source.corners.filter((c) => !evaluated.has(c.name)).map((c) => c.name),
    worst: worstJson(d.worst),
    findings: sortedFindings(findings).map(findingJson),
  };
}

export function analyzeJson(
  report: DocumentReport,
  designs: readonly DesignReport[],
  ctx: { readonly file: string; readonly version: string; readonly settings: CheckSettings },
): AnalyzeJson {
  return {
    schemaVersion: SCHEMA_VERSION,
    tool: { name: 'ampnote', version: ctx.version },
    file: ctx.file,
    caution: CAUTION,
    settings: ctx.settings,
    designs: designs.map((d) => designJson(d, findingsOfDesign(report, d.source.name))),
    findings: sortedFindings(report.findings.filter((f) => f.design === undefined)).map(findingJson),
  };
}
