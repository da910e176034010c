// Where a finding goes: the compensation element, the stages around it, a requirement, a field's range.
import {
  feedbackNode,
  type DesignModel,
  type DesignSource,
  type Element,
  type FieldOrigin,
  type NodeName,
  type Origin,
  type Requirement,
  type RequirementKind,
  type Stage,
} from '../language/model';
import type { SourceRange } from '../language/source';
import type { DesignAnalysis } from '../analysis/types';

export { primaryCompensation, type Compensation } from '../analysis/compensation';
import type { Compensation } from '../analysis/compensation';

/** The stage whose output node is `node`, with its index. */
export function stageAt(model: DesignModel, node: NodeName): { stage: Stage; index: number } | undefined {
  const index = model.stages.findIndex((s) => s.name === node);
  return index >= 0 ? { stage: model.stages[index]!, index } : undefined;
}

export function requirementOf<K extends RequirementKind>(
  model: DesignModel,
  kind: K,
): Extract<Requirement, { kind: K }> | undefined {
  return model.requirements.find((r) => r.kind === kind) as Extract<Requirement, { kind: K }> | undefined;
}

/** True when `measured` breaks `op required`. */
export function violates(op: '>=' | '<=', measured: number, required: number): boolean {
  return op === '>=' ? measured < required : measured > required;
}

export function field(origin: Origin, name: string): FieldOrigin | undefined {
  return origin.fields[name];
}

/** The range of a field, or the whole statement when the field was not written. */
export function fieldRange(origin: Origin, name: string): SourceRange {
  return origin.fields[name]?.range ?? origin.range;
}

/**
 * The place for a finding about the whole loop: the compensation capacitor when there is one; else the
 * element that sets the dominant pole (the load or stage at the node that takes the largest part in the
 * lowest pole: a loop compensated at its output is changed there); the design's name only when the
 * analysis names no such element.
 */
export function compensationRange(
  source: DesignSource,
  comp: Compensation | undefined,
  run?: { readonly model: DesignModel; readonly analysis: DesignAnalysis },
): SourceRange {
  if (comp) return fieldRange(comp.item.origin, 'cc');
  const element = run && dominantPoleElement(run.model, run.analysis);
  if (element) return fieldRange(element.origin, element.field);
  return (run && feedbackNode(run.model)?.origin.keywordRange) ?? source.nameRange;
}

/** The statement (a load or a stage) at the node that takes the largest part in the lowest pole. */
export function dominantPoleElement(
  model: DesignModel,
  analysis: DesignAnalysis,
): { readonly origin: Origin; readonly label: string; readonly field: string } | undefined {
  const lowest = sortedPoles(analysis.poles)[0];
  const node = lowest?.participation[0]?.node;
  if (node === undefined) return undefined;
  const load = model.loads.find((l) => l.node === node && l.cap !== undefined);
  if (load) return { origin: load.origin, label: `load at ${node}`, field: 'cap' };
  const stage = model.stages.find((s) => s.name === node);
  if (stage) return { origin: stage.origin, label: `stage ${stage.name}`, field: 'cap' };
  // The largest capacitor written as an element at that node (an output capacitor with its ESR).
  let cap: Extract<Element, { kind: 'cap' }> | undefined;
  for (const el of model.elements) {
    if (el.kind !== 'cap') continue;
    const touches = [el.a, el.b].some((t) => t.kind === 'node' && t.name === node);
    if (touches && (!cap || el.value > cap.value)) cap = el;
  }
  return cap ? { origin: cap.origin, label: `the capacitor at ${node}`, field: 'value' } : undefined;
}

/** Poles sorted by magnitude, lowest first. */
export function sortedPoles<T extends { readonly hz: number }>(poles: readonly T[]): T[] {
  return [...poles].sort((a, b) => a.hz - b.hz);
}

/** The share text of a pole (`first 62 %, second 38 %`). */
export function participationText(participation: readonly { node: string; share: number }[]): string {
  return participation
    .filter((p) => p.share >= 0.005)
    .map((p) => `${p.node} ${Math.round(p.share * 100)} %`)
    .join(', ');
}

/**
 * Whether the design is a feedback loop whose margins the default rules may judge: it has a gain stage, a
 * written `feedback`, or a requirement on the loop. A passive or element-only network (a filter driven by
 * one transconductance) is judged only against the requirements it states.
 */
export function judgedAsLoop(model: DesignModel): boolean {
  return (
    model.stages.length > 0 ||
    model.feedback.origin !== undefined ||
    model.requirements.some(
      (r) =>
        r.kind === 'pm' ||
        r.kind === 'gain-margin' ||
        r.kind === 'ugf' ||
        r.kind === 'zero' ||
        r.kind === 'settle',
    )
  );
}
