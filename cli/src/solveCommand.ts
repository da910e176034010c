// `ampnote solve FILE`: the least objective over each design's free parameters that meets every
// requirement in every corner; text or JSON, and `--write` to put the answer into the file.
import { resolve } from 'node:path';
import { formatSi } from '../../shared/src/format/si';
import { CAUTION } from '../../shared/src/protocol/panelData';
import { solveDesign, type DesignSolve } from '../../shared/src/solve/solveDesign';
import { applyEdits } from '../../shared/src/text/applyEdits';
import { loadDesigns } from './analyzeCommand';
import type { Command } from './args';
import type { CliContext } from './context';
import { placeJson } from './formatJson';
import { readText, warn, writeOutput } from './io';
import { EXIT_FINDINGS, EXIT_OK, EXIT_USAGE } from './run';
import { wrapWords } from './wrap';
import { writeFileSync } from 'node:fs';

type SolveCommand = Extract<Command, { kind: 'solve' }>;

export const SOLVE_SCHEMA_VERSION = 1;

export function runSolve(cmd: SolveCommand, ctx: CliContext): number {
  const loaded = loadDesigns(cmd.file, cmd.design, ctx);
  if (!loaded.ok) return loaded.code;
  const solves = loaded.designs.map((d) => solveDesign(d.source, { settings: ctx.settings }));
  const out = cmd.json
    ? `${JSON.stringify(solveJson(loaded.path, solves, ctx.version), null, 2)}\n`
    : solveText(loaded.path, solves);
  if (cmd.output !== undefined) {
    const problem = writeOutput(ctx.cwd, cmd.output, out, [cmd.file], cmd.config);
    if (problem) {
      warn(ctx.streams, `ampnote: ${problem}`);
      return EXIT_USAGE;
    }
  } else ctx.streams.stdout.write(out);
  if (cmd.write) {
    const edits = solves.filter((s) => s.status === 'met').flatMap((s) => s.edits);
    if (edits.length) {
      const abs = resolve(ctx.cwd, cmd.file);
      const read = readText(abs);
      const text = read.ok ? applyEdits(read.text, edits) : undefined;
      if (text === undefined) {
        warn(ctx.streams, `${loaded.path}: error: the file changed while solving; nothing written`);
        return EXIT_USAGE;
      }
      try {
        writeFileSync(abs, text, 'utf8');
      } catch (err) {
        warn(
          ctx.streams,
          `${loaded.path}: error: cannot write: ${err instanceof Error ? err.message : String(err)}`,
        );
        return EXIT_USAGE;
      }
      if (!cmd.quiet)
        warn(
          ctx.streams,
          `${loaded.path}: wrote the free parameters of ${solves.filter((s) => s.status === 'met').length} design(s)`,
        );
    }
  }
  return solves.some((s) => s.status === 'infeasible') ? EXIT_FINDINGS : EXIT_OK;
}

const number = (x: number) => (Number.isFinite(x) ? x : null);

export function solveJson(file: string, solves: readonly DesignSolve[], version: string) {
  return {
    schemaVersion: SOLVE_SCHEMA_VERSION,
    tool: { name: 'ampnote', version },
    file,
    caution: CAUTION,
    designs: solves.map((s) => ({
      name: s.design,
      status: s.status,
      values: s.values.map((v) => ({
        name: v.name,
        before: number(v.before),
        after: number(v.after),
        unit: v.unit,
        atBound: v.atBound,
      })),
      objective: {
        expression: s.objective.expression,
        unit: s.objective.unit,
        before: number(s.objective.before),
        after: number(s.objective.after),
      },
      requirements: s.requirements.map((r) => ({
        kind: r.kind,
        required: r.required,
        worst: { value: r.worst.value ?? null, text: r.worst.text, corner: r.worst.corner },
        met: r.met,
      })),
      binding: [...s.binding],
      edits: s.edits.map((e) => ({ ...placeJson(e.range), newText: e.newText })),
      note: s.note ?? null,
    })),
  };
}

function solveText(path: string, solves: readonly DesignSolve[]): string {
  const lines: string[] = [];
  for (const s of solves) {
    lines.push(`${path}: design ${s.design}: ${statusWords(s)}`);
    if (s.status === 'no-free-parameters') {
      lines.push('');
      continue;
    }
    for (const v of s.values) {
      const bound = v.atBound ? `  (at its ${v.atBound === 'low' ? 'lower' : 'upper'} bound)` : '';
      lines.push(`  ${v.name.padEnd(10)} ${v.beforeText} → ${v.afterText}${bound}`);
    }
    const unit = s.objective.unit;
    const show = (x: number) => (unit ? formatSi(x, unit) : `${+x.toPrecision(4)}`);
    lines.push(
      `  minimize   ${s.objective.expression}: ${show(s.objective.before)} → ${show(s.objective.after)}`,
    );
    for (const r of s.requirements) {
      const where = r.worst.corner === 'nominal' ? 'nominal' : `corner ${r.worst.corner}`;
      lines.push(`  ${r.met ? 'met ' : 'FAIL'}  ${r.label} ${r.required}: worst ${r.worst.text} (${where})`);
    }
    if (s.binding.length)
      lines.push(`  ${s.status === 'met' ? 'binding' : 'in conflict'}: ${s.binding.join('; ')}`);
    if (s.note) lines.push(...wrapWords(`note: ${s.note}`).map((l) => `  ${l}`));
    lines.push('');
  }
  lines.push(...wrapWords(`Note: ${CAUTION}`));
  return `${lines.join('\n')}\n`;
}

function statusWords(s: DesignSolve): string {
  switch (s.status) {
    case 'met':
      return 'every requirement met in every corner';
    case 'infeasible':
      return 'INFEASIBLE within the bounds';
    case 'no-free-parameters':
      return s.note ?? 'no free parameters';
    default: {
      const never: never = s.status;
      return never;
    }
  }
}
