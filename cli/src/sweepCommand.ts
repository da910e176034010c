// `ampnote sweep FILE`: each design's sweeps (or one ad-hoc sweep of any parameter with --param), the loop's
// margins at every point and corner, the worst value of each found between points; text, JSON or CSV.
import { formatDb, formatDeg, formatHz } from '../../shared/src/format/si';
import type { Finding } from '../../shared/src/checks/types';
import { dimensionName, lookupUnit } from '../../shared/src/language/unitTable';
import { CAUTION } from '../../shared/src/protocol/panelData';
import type { DesignReport } from '../../shared/src/report';
import { formatSweptValue, sweepFindings } from '../../shared/src/sweep/judgeSweep';
import {
  adHocSpec,
  metricsOf,
  specOf,
  sweepDesign,
  writeValue,
  type SweepMetrics,
  type SweepResult,
  type SweepSpec,
} from '../../shared/src/sweep/sweepDesign';
import { MAX_SWEEP_POINTS } from '../../shared/src/language/statements/sweep';
import { loadDesigns } from './analyzeCommand';
import type { Command } from './args';
import type { CliContext } from './context';
import { warn, writeOutput } from './io';
import { EXIT_FINDINGS, EXIT_OK, EXIT_USAGE } from './run';
import { wrapWords } from './wrap';

type SweepCommand = Extract<Command, { kind: 'sweep' }>;

export const SWEEP_SCHEMA_VERSION = 1;

interface DesignSweeps {
  readonly design: string;
  readonly sweeps: readonly { readonly result: SweepResult; readonly findings: readonly Finding[] }[];
}

export function runSweep(cmd: SweepCommand, ctx: CliContext): number {
  const loaded = loadDesigns(cmd.file, cmd.design, ctx);
  if (!loaded.ok) return loaded.code;
  const out: DesignSweeps[] = [];
  for (const d of loaded.designs) {
    const specs = specsOf(d, cmd);
    if (typeof specs === 'string') {
      warn(ctx.streams, `${loaded.path}: error: ${specs}`);
      return EXIT_USAGE;
    }
    out.push({
      design: d.source.name,
      sweeps: specs.map(({ spec, range }) => {
        const result = sweepDesign(d.source, spec);
        return { result, findings: sweepFindings(d.source, range, result) };
      }),
    });
  }
  const text = cmd.json
    ? `${JSON.stringify(sweepJson(loaded.path, out, ctx.version), null, 2)}\n`
    : cmd.csv
      ? sweepCsv(out)
      : sweepText(loaded.path, out);
  if (cmd.output !== undefined) {
    const problem = writeOutput(ctx.cwd, cmd.output, text, [cmd.file], cmd.config);
    if (problem) {
      warn(ctx.streams, `ampnote: ${problem}`);
      return EXIT_USAGE;
    }
  } else ctx.streams.stdout.write(text);
  const failed = out.some((d) => d.sweeps.some((s) => s.findings.some((f) => f.severity === 'error')));
  return failed ? EXIT_FINDINGS : EXIT_OK;
}

/** The sweeps to run on one design: its own, or the ad-hoc one; a string is a usage error. */
function specsOf(
  d: DesignReport,
  cmd: SweepCommand,
): { spec: SweepSpec; range: DesignReport['source']['range'] }[] | string {
  if (cmd.param === undefined) {
    const own = d.source.nominal?.sweeps ?? [];
    return own.flatMap((s) => {
      const spec = specOf(d.source, s);
      if (!spec) return [];
      return [
        { spec: cmd.points !== undefined ? { ...spec, points: cmd.points } : spec, range: s.origin.range },
      ];
    });
  }
  const param = d.source.nominal?.params.find((p) => p.name === cmd.param);
  if (!param) return `design ${d.source.name} has no parameter "${cmd.param}"`;
  const low = readValue(cmd.from!, param.dimension);
  const high = readValue(cmd.to!, param.dimension);
  if (typeof low === 'string') return `--from: ${low}`;
  if (typeof high === 'string') return `--to: ${high}`;
  if (!(low < high)) return '--from must be below --to';
  const spec = adHocSpec(d.source, cmd.param, { low, high, ...(cmd.points ? { points: cmd.points } : {}) });
  if (!spec) return `design ${d.source.name} has no parameter "${cmd.param}"`;
  if (writeValue(1, spec.dimension) === undefined)
    return `"${cmd.param}" is a quantity in ${spec.dimension}, which a sweep cannot write`;
  return [{ spec, range: d.source.nameRange }];
}

/** `1pF`, `1 pF`, `1e-12`: a number in SI, with an optional unit of the parameter's dimension. */
export function readValue(text: string, dimension: string): number | string {
  const m = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S*)\s*$/.exec(text);
  if (!m) return `"${text}" is not a number`;
  const n = Number(m[1]);
  if (!m[2]) return n;
  const unit = lookupUnit(m[2]);
  if (!unit) return `unknown unit "${m[2]}"`;
  const dim = dimensionName(unit.dim);
  if (dim !== dimension && !(dim === '1' && unit.exp10 !== 0))
    return `"${text}" is not ${dimension === '1' ? 'a plain number' : `in ${dimension}`} like the parameter`;
  return n * 10 ** unit.exp10;
}

const QUANTITIES = ['phaseMarginDeg', 'ugfHz', 'gainMarginDb', 'loopDcGainDb'] as const;
type Quantity = (typeof QUANTITIES)[number];

/** The lowest value of each quantity over corners and range; the margins' found between points. */
function worstOf(r: SweepResult): Record<Quantity, { value: number; at: number; corner: string } | null> {
  const out = {} as Record<Quantity, { value: number; at: number; corner: string } | null>;
  for (const q of QUANTITIES) {
    let best: { value: number; at: number; corner: string } | null = null;
    for (const s of r.samples)
      s.runs.forEach((run, c) => {
        const v = run ? metricsOf(run.analysis)[q] : undefined;
        if (v !== undefined && (!best || v < best.value))
          best = { value: v, at: s.value, corner: r.corners[c]! };
      });
    if (q === 'phaseMarginDeg' || q === 'gainMarginDb')
      for (const m of r.minima) {
        const e = m[q];
        if (e && (!best || e.value < best.value)) best = { value: e.value, at: e.at, corner: e.corner };
      }
    out[q] = best;
  }
  return out;
}

const num = (x: number | undefined) => (x !== undefined && Number.isFinite(x) ? x : null);

function pointsOf(r: SweepResult) {
  return r.samples.flatMap((s) =>
    s.runs.map((run, c) => {
      const m: SweepMetrics = run ? metricsOf(run.analysis) : {};
      return {
        value: s.value,
        corner: r.corners[c]!,
        phaseMarginDeg: num(m.phaseMarginDeg),
        ugfHz: num(m.ugfHz),
        gainMarginDb: num(m.gainMarginDb),
        loopDcGainDb: num(m.loopDcGainDb),
        stable: m.stable ?? null,
      };
    }),
  );
}

const unitOf = (spec: SweepSpec) => writeValue(1, spec.dimension)?.replace(/^1 ?/, '') ?? '';

export function sweepJson(file: string, designs: readonly DesignSweeps[], version: string) {
  return {
    schemaVersion: SWEEP_SCHEMA_VERSION,
    tool: { name: 'ampnote', version },
    file,
    caution: CAUTION,
    designs: designs.map((d) => ({
      name: d.design,
      sweeps: d.sweeps.map(({ result, findings }) => ({
        param: result.spec.param,
        unit: unitOf(result.spec),
        scale: result.spec.scale,
        points: pointsOf(result),
        worst: worstOf(result),
        findings: findings.map((f) => ({ severity: f.severity, message: f.message })),
      })),
    })),
  };
}

function sweepCsv(designs: readonly DesignSweeps[]): string {
  const rows: string[] = [];
  const unit = designs.flatMap((d) => d.sweeps).map((s) => unitOf(s.result.spec));
  const sameUnit = unit.every((u) => u === unit[0]);
  rows.push(
    [
      'design',
      'param',
      sameUnit && unit[0] ? `value (${unit[0]})` : 'value (SI)',
      'corner',
      'phase margin (deg)',
      'ugf (Hz)',
      'gain margin (dB)',
      'loop dc gain (dB)',
      'stable',
    ].join(','),
  );
  const cell = (x: number | boolean | null) => (x === null ? '' : String(x));
  for (const d of designs)
    for (const { result } of d.sweeps)
      for (const p of pointsOf(result))
        rows.push(
          [
            d.design,
            result.spec.param,
            cell(p.value),
            p.corner,
            cell(p.phaseMarginDeg),
            cell(p.ugfHz),
            cell(p.gainMarginDb),
            cell(p.loopDcGainDb),
            cell(p.stable),
          ].join(','),
        );
  rows.push(`# ${CAUTION}`);
  return `${rows.join('\n')}\n`;
}

function sweepText(path: string, designs: readonly DesignSweeps[]): string {
  const lines: string[] = [];
  for (const d of designs) {
    if (!d.sweeps.length) {
      lines.push(
        `${path}: design ${d.design}: no sweep (write \`sweep NAME from LOW to HIGH\`, or use --param)`,
      );
      lines.push('');
      continue;
    }
    for (const { result, findings } of d.sweeps) {
      const { spec } = result;
      const v = (x: number) => formatSweptValue(spec, x);
      lines.push(
        `${path}: design ${d.design}: ${spec.param} from ${v(spec.low)} to ${v(spec.high)}, ${spec.points} points (${spec.scale})${result.corners.length > 1 ? `, corners ${result.corners.join(', ')}` : ''}`,
      );
      const w = worstOf(result);
      const where = (e: { at: number; corner: string }) =>
        `at ${v(e.at)}${result.corners.length > 1 ? ` (${e.corner})` : ''}`;
      const show: Record<Quantity, [string, (x: number) => string]> = {
        phaseMarginDeg: ['phase margin', formatDeg],
        ugfHz: ['UGF', formatHz],
        gainMarginDb: ['gain margin', formatDb],
        loopDcGainDb: ['loop DC gain', formatDb],
      };
      for (const q of QUANTITIES) {
        const e = w[q];
        const [label, fmt] = show[q];
        lines.push(`  lowest ${label.padEnd(13)} ${e ? `${fmt(e.value)} ${where(e)}` : '—'}`);
      }
      const unstable = result.samples.some((s) =>
        s.runs.some((r) => r && metricsOf(r.analysis).stable === false),
      );
      lines.push(`  closed loop   ${unstable ? 'UNSTABLE somewhere in the range' : 'stable over the range'}`);
      for (const f of findings) lines.push(...wrapWords(`${f.severity}: ${f.message}`).map((l) => `  ${l}`));
      lines.push('');
    }
  }
  lines.push(...wrapWords(`Note: ${CAUTION}`));
  return `${lines.join('\n')}\n`;
}
