// Hand-made designs and analyses for the checks: a two-stage Miller amplifier laid out on known lines, and
// analysis results built from the numbers each test states.
import type { Ratio } from '../../../shared/src/units';
import type { DesignAnalysis, LoopMetrics, Pole, Zero } from '../../../shared/src/analysis/types';
import type { CheckInput } from '../../../shared/src/checks/context';
import { DEFAULT_CHECK_SETTINGS, type CheckSettings } from '../../../shared/src/checks/settings';
import type {
  DesignModel,
  DesignSource,
  FieldOrigin,
  Miller,
  NodeName,
  Origin,
  Requirement,
  Stage,
} from '../../../shared/src/language/model';
import type { SourceRange } from '../../../shared/src/language/source';
import type { CornerRun } from '../../../shared/src/report';

export const range = (line: number, start: number, end: number): SourceRange => ({
  start: { line, character: start },
  end: { line, character: end },
});

/** A statement on `line` whose fields sit at the given columns (each 6 characters wide). */
export function origin(
  line: number,
  fields: Record<string, number> = {},
  param: Record<string, string> = {},
): Origin {
  const f: Record<string, FieldOrigin> = {};
  for (const [name, col] of Object.entries(fields)) {
    f[name] = { range: range(line, col, col + 6), text: 'x', ...(param[name] ? { param: param[name] } : {}) };
  }
  return {
    range: range(line, 2, 60),
    keywordRange: range(line, 2, 7),
    insertAt: { line, character: 60 },
    fields: f,
  };
}

export const node = (n: string) => n as NodeName;

export interface TwoStage {
  gm1: number;
  r1: number;
  c1: number;
  gm2: number;
  r2: number;
  c2: number;
  cl: number;
  cc: number;
  rz?: number;
  requirements?: Requirement[];
  bias1?: number;
  bias2?: number;
  corner?: string;
}

// Lines: 0 design, 1 stage first, 2 stage second, 3 load, 4 miller, 5.. requirements, last `end`.
export const LINE = { design: 0, first: 1, second: 2, load: 3, miller: 4, require: 5 } as const;

export function twoStage(p: TwoStage): DesignModel {
  const first: Stage = {
    name: node('first'),
    input: { kind: 'node', name: node('in') },
    gm: p.gm1 as Stage['gm'],
    rout: p.r1 as Stage['rout'],
    cap: p.c1 as Stage['cap'],
    polarity: 'noninverting',
    ...(p.bias1 !== undefined ? { bias: p.bias1 as NonNullable<Stage['bias']> } : {}),
    origin: origin(LINE.first, { gm: 20, rout: 30, cap: 40, bias: 50 }),
  };
  const second: Stage = {
    name: node('second'),
    input: { kind: 'node', name: node('first') },
    gm: p.gm2 as Stage['gm'],
    rout: p.r2 as Stage['rout'],
    cap: p.c2 as Stage['cap'],
    polarity: 'inverting',
    ...(p.bias2 !== undefined ? { bias: p.bias2 as NonNullable<Stage['bias']> } : {}),
    origin: origin(LINE.second, { gm: 20, rout: 30, cap: 40, bias: 50 }),
  };
  const miller: Miller = {
    from: node('first'),
    to: node('second'),
    cc: p.cc as Miller['cc'],
    ...(p.rz !== undefined ? { rz: p.rz as NonNullable<Miller['rz']> } : {}),
    origin: origin(LINE.miller, p.rz !== undefined ? { cc: 30, rz: 40 } : { cc: 30 }),
  };
  return {
    name: 'amp',
    ...(p.corner ? { corner: p.corner } : {}),
    nodes: [],
    input: node('in'),
    output: node('second'),
    stages: [first, second],
    loads: [{ node: node('second'), cap: p.cl as Miller['cc'], origin: origin(LINE.load, { cap: 20 }) }],
    millers: [miller],
    buffered: [],
    elements: [],
    feedback: { kind: 'factor', beta: 1 as Ratio },
    requirements: p.requirements ?? [],
    params: [],
  };
}

export function requirePm(value: number, line = LINE.require): Requirement {
  return { kind: 'pm', op: '>=', value: value as never, origin: origin(line) };
}

export function pole(hz: number, participation: { node: string; share: number }[] = [], damping = 1): Pole {
  const w = 2 * Math.PI * hz;
  const re = -damping * w;
  const im = w * Math.sqrt(Math.max(0, 1 - damping * damping));
  return {
    s: { re, im },
    hz,
    damping,
    participation,
    namedAfter: participation.find((p) => p.share >= 0.8)?.node ?? 'shared',
  };
}

export function zero(hz: number, rhp: boolean): Zero {
  const w = 2 * Math.PI * hz;
  return { s: { re: rhp ? w : -w, im: 0 }, hz, rhp };
}

export function analysis(a: {
  poles?: Pole[];
  zeros?: Zero[];
  dcGain?: number;
  loop?: Partial<LoopMetrics>;
  extra?: Partial<DesignAnalysis>;
}): DesignAnalysis {
  const ugf = a.loop?.ugfHz;
  return {
    poles: a.poles ?? [],
    zeros: a.zeros ?? [],
    dcGain: a.dcGain ?? -1e4,
    loop: {
      dcGain: Math.abs(a.dcGain ?? 1e4),
      crossings:
        ugf !== undefined
          ? [{ hz: ugf, direction: 'down', phaseDeg: (a.loop?.phaseMarginDeg ?? 60) - 180 }]
          : [],
      peakingDb: 0,
      ...a.loop,
    },
    problems: [],
    ...a.extra,
  };
}

export function source(model: DesignModel, lines = 12): DesignSource {
  return {
    name: model.name,
    range: { start: { line: 0, character: 0 }, end: { line: lines, character: 3 } },
    nameRange: range(0, 7, 10),
    text: '',
    nominal: model,
    corners: [],
    symbols: [],
  };
}

export function input(
  runs: { model: DesignModel; analysis: DesignAnalysis; corner?: string }[],
  settings: Partial<CheckSettings> = {},
): CheckInput {
  const cornerRuns: CornerRun[] = runs.map((r) => ({
    corner: r.corner ?? 'nominal',
    model: r.model,
    analysis: r.analysis,
  }));
  return {
    source: source(runs[0]!.model),
    runs: cornerRuns,
    settings: { ...DEFAULT_CHECK_SETTINGS, ...settings },
  };
}

/** A typical two-stage: gm1 150 µS, gm2 2.2 mS, Cc 1.1 pF (an invented demo design). */
export const BASE: TwoStage = {
  gm1: 150e-6,
  r1: 1.8e6,
  c1: 90e-15,
  gm2: 2.2e-3,
  r2: 120e3,
  c2: 250e-15,
  cl: 3e-12,
  cc: 1.1e-12,
};
