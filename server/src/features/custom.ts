// The extension's own requests: the panel's data, the status bar's summary, the panel's "apply" edit, and
// the solve of a design's free parameters.
import type { CancellationToken } from 'vscode-languageserver';
import type {
  CompensationEditParams,
  CompensationEditResult,
  DesignSummaryParams,
  DesignSummaryResult,
  PanelDataParams,
  PanelDataResult,
  SolveDesignParams,
  SolveDesignResult,
} from '../../../shared/src/protocol/requests';
import { buildPanelData, compensationAt } from '../../../shared/src/panel/buildPanelData';
import type { CompensationTarget } from '../../../shared/src/protocol/panelData';
import type { CheckSettings } from '../../../shared/src/checks/settings';
import type { DocumentReport, DesignReport } from '../../../shared/src/report';
import { compensationEdits, designAt, designNamed } from '../../../shared/src/service';
import { refuseEdits, unwritableValue } from '../../../shared/src/writtenValues';
import { toEdit } from '../convert';
import { solveDesign } from '../../../shared/src/solve/solveDesign';
import { solveSummary } from '../../../shared/src/solve/solveSummary';
import { nominal } from './describe';

const isPosition = (p: unknown): p is { line: number; character: number } =>
  !!p &&
  typeof p === 'object' &&
  Number.isInteger((p as { line: unknown }).line) &&
  Number.isInteger((p as { character: unknown }).character);

function pick(report: DocumentReport, design?: unknown, position?: unknown): DesignReport | undefined {
  if (typeof design === 'string') return designNamed(report, design);
  if (isPosition(position)) return designAt(report, position) ?? report.designs[0];
  return report.designs[0];
}

/** A well-formed target from the wire (whether the design has it is the engine's question). */
function asTarget(t: unknown): CompensationTarget | undefined {
  if (!t || typeof t !== 'object') return undefined;
  const { kind, index } = t as { kind: unknown; index: unknown };
  if ((kind !== 'miller' && kind !== 'buffered') || !Number.isInteger(index) || (index as number) < 0)
    return undefined;
  return { kind, index: index as number };
}

const finitePositive = (x: unknown) =>
  typeof x === 'number' && Number.isFinite(x) && x >= 0 ? x : undefined;

/** Free parameters' values from the wire: names to numbers (the engine refuses unusable numbers). */
function freeValues(v: unknown): Record<string, number> | undefined {
  if (!v || typeof v !== 'object' || Array.isArray(v)) return undefined;
  const out: Record<string, number> = {};
  for (const [name, value] of Object.entries(v)) if (typeof value === 'number') out[name] = value;
  return out;
}

export function panelData(
  report: DocumentReport,
  params: PanelDataParams,
  settings: CheckSettings,
  token: CancellationToken,
): PanelDataResult {
  const design = pick(report, params.design, params.position);
  const model = design?.source.nominal;
  if (!model) return null;
  const cc = finitePositive(params.cc);
  const rz = finitePositive(params.rz);
  const free = freeValues(params.free);
  // The cursor on a compensation line picks that element; elsewhere the element asked for (or the default).
  const compensation =
    (isPosition(params.compensationAt) ? compensationAt(model, params.compensationAt) : undefined) ??
    asTarget(params.compensation);
  const data = buildPanelData(model, params.uri, {
    ...(cc !== undefined ? { cc } : {}),
    ...(rz !== undefined ? { rz } : {}),
    ...(compensation ? { compensation } : {}),
    token,
    settleTolerance: settings.settleTolerance,
    source: design.source,
    ...(free ? { free } : {}),
  });
  return data ?? null;
}

export function designSummary(report: DocumentReport, params: DesignSummaryParams): DesignSummaryResult {
  if (!isPosition(params.position)) return null;
  const design = designAt(report, params.position);
  if (!design) return null;
  const loop = nominal(design)?.analysis.loop;
  const worst = design.worst.phaseMarginDeg;
  return {
    design: design.source.name,
    ...(loop?.ugfHz !== undefined ? { ugfHz: loop.ugfHz } : {}),
    ...(loop?.phaseMarginDeg !== undefined ? { phaseMarginDeg: loop.phaseMarginDeg } : {}),
    ...(worst && design.runs.length > 1 ? { worstCorner: worst.corner } : {}),
  };
}

export function compensationEdit(
  report: DocumentReport,
  params: CompensationEditParams,
): CompensationEditResult {
  const design = pick(report, params.design);
  if (!design) return null;
  // A target sent but malformed writes nothing rather than falling back to another element.
  const target = params.compensation === undefined ? undefined : asTarget(params.compensation);
  if (params.compensation !== undefined && !target) return null;
  // A value sent but unusable is refused with its reason, never dropped while the other one is written.
  const bad =
    (params.cc !== undefined ? unwritableValue(params.cc, 'cc') : undefined) ??
    (params.rz !== undefined ? unwritableValue(params.rz, 'rz', true) : undefined);
  if (bad) return { edits: [], refused: bad };
  const edits = compensationEdits(design, params.cc, params.rz, target);
  if (!edits.length) return null;
  const refused = refuseEdits(design.source, edits);
  return refused ? { edits: [], refused } : { edits: edits.map(toEdit) };
}

/** The solve of one design's free parameters, for the code lens and its command. */
export function solveDesignRequest(
  report: DocumentReport,
  params: SolveDesignParams,
  settings: CheckSettings,
): SolveDesignResult {
  const design = pick(report, params.design);
  if (!design) return null;
  const solve = solveDesign(design.source, { settings });
  return {
    status: solve.status,
    summary: solveSummary(solve),
    edits: solve.status === 'met' ? solve.edits.map(toEdit) : [],
    values: solve.values.map((v) => ({ name: v.name, value: v.after })),
  };
}
