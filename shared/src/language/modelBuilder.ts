// One evaluation of a design into a DesignModel: the nominal one, or one corner with its overrides. Errors
// are reported where they are made, once: a statement that fails adds nothing to the model, and whatever
// depends on it stays silent. What each statement adds is its kind's (statements/); this class evaluates
// values and nodes for them and puts the model together.
import { si } from '../units';
import { closest } from './closestWord';
import { CornerReporter, quote, type Reporter } from './diagnostics';
import type { DesignScope } from './designScope';
import { listNodes } from './designNodes';
import { evaluate, type Quantity, type Related } from './evaluateExpression';
import { forEachRef, walkExpr, type Expr } from './expression';
import { spanRange, tokenRange, type Token } from './lexer';
import type { DesignModel, FieldOrigin, FreeRange, NodeName, NodeRef, Origin, Param } from './model';
import { appendParts, countParts, emptyParts, NOTHING, type Built, type PartLists } from './modelParts';
import { node } from './nodeName';
import type { Overrides } from './overrides';
import { checkValue, type ViaParam } from './plausibility';
import type { SourceRange } from './source';
import {
  kindOf,
  type BuildContext,
  type EvaluatedFields,
  type FieldResult,
  type FieldSpec,
  type StatementOf,
} from './statements';
import type { Statement } from './syntax';
import {
  DIM,
  describeDimension,
  dimensionName,
  isDimensionless,
  lookupUnit,
  sameDimension,
  type Dimension,
} from './unitTable';

/** One evaluation of a design: nominal, or one corner. */
export class ModelBuilder implements BuildContext {
  private readonly paramState = new Map<string, Quantity | null | 'visiting'>();
  private readonly stack: string[] = [];
  private readonly cycleMembers = new Set<string>();
  /** Set when this corner cannot give a complete model (an override failed, or a statement broke). */
  incomplete = false;

  /** The nominal parameter dimensions, for checking corner overrides. */
  private readonly nominalDims?: ReadonlyMap<string, Dimension>;
  /** What the nominal model built from each statement, for a corner. */
  private readonly reuse?: ReadonlyMap<Statement, Built>;
  /** What each statement added to this model, so that corners can take over what they do not change. */
  readonly produced = new Map<Statement, Built>();
  /** Parameters whose value this corner may change: the overridden ones and all that depend on them. */
  private readonly affectedParams: ReadonlySet<string>;

  constructor(
    readonly scope: DesignScope,
    readonly overrides: Overrides,
    /** For a corner: the nominal evaluation, already built. */
    nominal?: ModelBuilder,
    corner?: StatementOf<'corner'>,
  ) {
    this.nominalDims = nominal?.nominalDimensions();
    this.reuse = nominal?.produced;
    this.sink =
      corner?.name !== undefined
        ? new CornerReporter(scope.sink, corner.name.text, corner.range, tokenRange(corner.name))
        : scope.sink;
    this.affectedParams = paramsReachedBy(scope, overrides);
  }

  /** True when this corner's overrides can change what the statement builds. */
  private affects(s: Statement): boolean {
    if (this.overrides.fields.has(s)) return true;
    if (!this.affectedParams.size) return false;
    let hit = false;
    for (const f of s.fields)
      forEachRef(f.expr, (r) => {
        if (this.affectedParams.has(r)) hit = true;
      });
    return hit;
  }

  /** Where this evaluation reports: the parse's sink, or for a corner an adapter that names the corner. */
  readonly sink: Reporter;

  // ---- parameters ----

  param(name: string): Quantity | undefined {
    const state = this.paramState.get(name);
    if (state === 'visiting') {
      this.reportCycle(name);
      return undefined;
    }
    if (state !== undefined) return state ?? undefined;
    const stmt = this.scope.params.get(name)!;
    const override = this.overrides.params.get(name);
    const field = stmt.fields.find((f) => f.name === 'value');
    const expr = override?.expr ?? field?.expr;
    if (!expr || (!override && this.scope.skipped.has(stmt))) {
      this.paramState.set(name, null);
      return undefined;
    }
    this.paramState.set(name, 'visiting');
    this.stack.push(name);
    let q = this.eval(expr, false);
    this.stack.pop();
    if (this.cycleMembers.has(name)) q = undefined;
    if (q && !Number.isFinite(q.value)) {
      this.sink.error(
        'plausibility',
        `Parameter ${quote(name)} is not a finite number (a division by zero, or a number too large?).`,
        expr.range,
      );
      q = undefined;
    }
    if (q && override && this.nominalDims?.has(name)) {
      const want = this.nominalDims.get(name)!;
      if (isDimensionless(q.dim) && !isDimensionless(want)) q = { value: q.value, dim: want };
      else if (!sameDimension(q.dim, want)) {
        this.sink.error(
          'unit',
          `Parameter ${quote(name)} is ${describeDimension(want)}; this corner gives ${describeDimension(q.dim)}.`,
          override.expr.range,
          this.dimensionSources(override.expr),
        );
        q = undefined;
      }
    }
    if (!q && override) this.incomplete = true;
    this.paramState.set(name, q ?? null);
    return q;
  }

  private reportCycle(name: string): void {
    const members = this.stack.slice(this.stack.indexOf(name));
    if (members.some((m) => this.cycleMembers.has(m))) return;
    for (const m of members) this.cycleMembers.add(m);
    const declOf = (m: string): SourceRange => tokenRange(this.scope.decls.get(m)!.token);
    // Report at the member declared first, so the message does not depend on where evaluation entered.
    const order = [...members].sort((a, b) => {
      const ra = declOf(a).start;
      const rb = declOf(b).start;
      return ra.line - rb.line || ra.character - rb.character;
    });
    const first = order[0]!;
    const rotated = [...members.slice(members.indexOf(first)), ...members.slice(0, members.indexOf(first))];
    const chain = [...rotated, first].map(quote).join(' → ');
    const message =
      members.length === 1
        ? `Parameter ${quote(first)} refers to itself.`
        : `Parameters depend on each other in a cycle: ${chain}.`;
    this.sink.error(
      'reference',
      message,
      declOf(first),
      rotated.slice(1).map((m) => ({ range: declOf(m), message: `${quote(m)} is part of the cycle` })),
    );
  }

  /** Evaluates an expression; `ugfAllowed` binds `ugf` (only inside `require zero`). */
  eval(expr: Expr, ugfAllowed: boolean): Quantity | undefined {
    // A plain number needs no resolver; and the two resolvers are made once per builder, not per value.
    if (expr.kind === 'number') return { value: expr.value, dim: expr.dim };
    return evaluate(
      expr,
      ugfAllowed ? this.resolveWithUgf : this.resolveValue,
      this.sink,
      this.dimensionSources,
    );
  }

  /**
   * The literals whose units give an expression its dimension, following parameters (as this evaluation
   * sees them, overrides included): a dimension error is reported at the use and points at these, since a
   * wrong unit is usually written somewhere else (`param kp = 50 uA/V` for a kp meant in A/V^2).
   */
  readonly dimensionSources = (e: Expr): Related => {
    const out: Related = [];
    const seen = new Set<string>();
    const visit = (x: Expr, param?: string): void =>
      walkExpr(x, (n) => {
        if (n.kind === 'number' && n.unitText !== undefined && !isDimensionless(n.dim)) {
          const text = quote(`${n.numberText} ${n.unitText}`);
          (out as Related[number][]).push({
            range: n.range,
            message: `${text}${param ? ` (in ${quote(param)})` : ''} is ${describeDimension(n.dim)}`,
          });
        } else if (n.kind === 'ref' && this.scope.params.has(n.name) && !seen.has(n.name)) {
          seen.add(n.name);
          const source =
            this.overrides.params.get(n.name)?.expr ?? this.scope.params.get(n.name)!.fields[0]?.expr;
          if (source) visit(source, n.name);
        }
      });
    visit(e);
    return out;
  };

  private readonly resolveValue = (name: string, range: SourceRange): Quantity | undefined =>
    this.resolve(name, range, false);
  private readonly resolveWithUgf = (name: string, range: SourceRange): Quantity | undefined =>
    this.resolve(name, range, true);

  private resolve(name: string, range: SourceRange, ugfAllowed: boolean): Quantity | undefined {
    if (ugfAllowed && name === 'ugf') return { value: 1, dim: DIM.ugf };
    const decl = this.scope.decls.get(name);
    if (decl?.kind === 'param') return this.param(name);
    if (decl) {
      this.sink.error('reference', `${quote(name)} is a ${decl.kind} (a node), not a value.`, range);
      return undefined;
    }
    if (this.scope.tentative.has(name)) return undefined;
    const near = closest(name, [...this.scope.params.keys(), ...(ugfAllowed ? ['ugf'] : [])]);
    const hint = near
      ? ` Did you mean ${quote(near)}?`
      : name === 'ugf'
        ? ' `ugf` can only be used in `require zero >= N * ugf`.'
        : lookupUnit(name)
          ? ` ${quote(name)} is a unit: it follows a number, and a compound unit has no spaces (\`V/us\`).`
          : '';
    this.sink.error('reference', `Undefined name ${quote(name)}.${hint}`, range);
    return undefined;
  }

  // ---- fields ----

  field(s: Statement, spec: FieldSpec, displayName = spec.name): FieldResult {
    const { name, unit: dimName, role } = spec;
    const override = this.overrides.fields.get(s)?.get(name);
    const written = s.fields.find((f) => f.name === name);
    const expr = override?.expr ?? written?.expr;
    const text = override?.text ?? written?.text ?? '';
    if (!expr) return { status: 'absent' };
    const fail = (): FieldResult => {
      if (override) this.incomplete = true;
      return { status: 'failed' };
    };
    const q = this.eval(expr, dimName === 'ugf');
    if (!q) return fail();
    const want = DIM[dimName];
    if (!isDimensionless(q.dim) && !sameDimension(q.dim, want)) {
      this.sink.error(
        'unit',
        `${quote(displayName)} expects ${describeDimension(want)}, but this is ${describeDimension(q.dim)}.`,
        expr.range,
        this.dimensionSources(expr).slice(0, 6),
      );
      return fail();
    }
    if (!checkValue(role, displayName, q.value, expr, expr.range, this.sink, this.viaParam(expr)))
      return fail();
    const param = expr.kind === 'ref' && this.scope.params.has(expr.name) ? expr.name : undefined;
    return { status: 'ok', value: q.value, origin: { range: expr.range, text, ...(param ? { param } : {}) } };
  }

  fields(s: Statement, specs: readonly FieldSpec[]): EvaluatedFields | undefined {
    const values: Record<string, number> = {};
    const origins: Record<string, FieldOrigin> = {};
    let ok = true;
    const missing: string[] = [];
    for (const spec of specs) {
      const r = this.field(s, spec);
      if (r.status === 'ok') {
        values[spec.name] = r.value;
        origins[spec.name] = r.origin;
      } else if (r.status === 'failed') ok = false;
      else if (spec.required) missing.push(spec.name);
    }
    if (missing.length) {
      this.reportMissing(s, missing);
      ok = false;
    }
    return ok ? { values, origins } : undefined;
  }

  private reportMissing(s: Statement, missing: readonly string[]): void {
    const blame = 'name' in s && s.name ? spanRange(s.keyword, s.name) : tokenRange(s.keyword);
    this.sink.error(
      'syntax',
      `${quote(s.kind)} needs ${missing.map((m) => quote(`${m} = …`)).join(' and ')}.`,
      blame,
    );
  }

  quantity(
    s: Statement,
    name: string,
  ): { value: number; dimension: string; origin: FieldOrigin } | undefined {
    const override = this.overrides.fields.get(s)?.get(name);
    const written = s.fields.find((f) => f.name === name);
    const expr = override?.expr ?? written?.expr;
    if (!expr) return undefined;
    const q = this.eval(expr, false);
    if (!q) return undefined;
    if (!Number.isFinite(q.value)) {
      this.sink.error('plausibility', 'This value is not a finite number.', expr.range);
      return undefined;
    }
    return {
      value: q.value,
      dimension: dimensionName(q.dim),
      origin: { range: expr.range, text: override?.text ?? written?.text ?? '' },
    };
  }

  writtenExpr(s: Statement, name: string): Expr | undefined {
    return this.overrides.fields.get(s)?.get(name)?.expr ?? s.fields.find((f) => f.name === name)?.expr;
  }

  /** For `gm = gm1` where `param gm1 = 150` (a literal, not overridden here): that literal. */
  private viaParam(expr: Expr): ViaParam | undefined {
    if (expr.kind !== 'ref' || this.overrides.params.has(expr.name)) return undefined;
    const literal = this.scope.params.get(expr.name)?.fields[0]?.expr;
    return literal?.kind === 'number' ? { name: expr.name, literal } : undefined;
  }

  // ---- nodes ----

  resolveNode(t: Token): NodeRef | undefined {
    const name = t.text;
    if (name === 'gnd') return { kind: 'ground' };
    if (name === 'in') return { kind: 'node', name: node('in') };
    const decl = this.scope.decls.get(name);
    if (decl && decl.kind !== 'param') return { kind: 'node', name: node(name) };
    if (name === 'out') return { kind: 'node', name: node('out') };
    if (decl) {
      this.sink.error('reference', `${quote(name)} is a parameter, not a node.`, tokenRange(t));
      return undefined;
    }
    if (this.scope.tentative.has(name)) return undefined;
    const nodes = [...this.scope.decls.values()].filter((d) => d.kind !== 'param').map((d) => d.token.text);
    const near = closest(name, [...nodes, 'in', 'gnd', 'out']);
    this.sink.error(
      'reference',
      `Undefined node ${quote(name)}.${near ? ` Did you mean ${quote(near)}?` : ''}`,
      tokenRange(t),
    );
    return undefined;
  }

  resolveNodeName(t: Token, what: string): NodeName | undefined {
    const ref = this.resolveNode(t);
    if (ref?.kind === 'ground') {
      this.sink.error('reference', `${what} cannot be ground.`, tokenRange(t));
      return undefined;
    }
    return ref?.name;
  }

  origin(s: Statement, fields: Record<string, FieldOrigin>): Origin {
    return { range: s.range, keywordRange: tokenRange(s.keyword), insertAt: s.insertAt, fields };
  }

  // ---- the whole model ----

  build(): DesignModel | undefined {
    const nodes = listNodes(this.scope);
    const output = this.output();
    const parts = this.buildStatements();
    const params = this.listParams();
    if (!output) return undefined;
    const feedback = parts.feedback[0];
    return {
      name: this.scope.design.name,
      nodes,
      input: node('in'),
      output,
      stages: parts.stages,
      loads: parts.loads,
      millers: parts.millers,
      buffered: parts.buffered,
      elements: parts.elements,
      feedback: feedback ?? { kind: 'factor', beta: si(1) },
      ...(parts.supplies.length > 0 ? { supplies: parts.supplies } : {}),
      requirements: parts.requirements,
      params,
      ...(parts.objective[0] ? { minimize: parts.objective[0] } : {}),
      sweeps: parts.sweeps,
    };
  }

  /** The design's output: named by `output`, else the last stage, else `out` when the text uses it. */
  output(): NodeName | undefined {
    this.resolvedOutput ??= { node: this.resolveOutput() };
    return this.resolvedOutput.node;
  }
  private resolvedOutput?: { readonly node: NodeName | undefined };

  private resolveOutput(): NodeName | undefined {
    const { scope, sink } = this;
    const outputs = scope.design.statements.filter((s): s is StatementOf<'output'> => s.kind === 'output');
    for (const s of outputs.slice(1))
      sink.error('syntax', '`output` is given twice; the first one is used.', tokenRange(s.keyword), [
        { range: tokenRange(outputs[0]!.keyword), message: 'first `output`' },
      ]);
    // Without an output there is no model, but every statement is still evaluated so that all of its
    // mistakes are reported.
    if (outputs[0]) return this.writtenOutput(outputs[0]);
    if (scope.stages.length) return node(scope.stages[scope.stages.length - 1]!.name!.text);
    if (scope.mentionsOut() || scope.decls.get('out')?.kind === 'node') return node('out');
    const design = scope.design;
    sink.error(
      'reference',
      `Design ${quote(design.name)} has no stage and names no output: add \`output NODE\`.`,
      design.nameToken ? tokenRange(design.nameToken) : tokenRange(design.keyword),
    );
    return undefined;
  }

  private writtenOutput(s: StatementOf<'output'>): NodeName | undefined {
    if (!s.node || this.scope.skipped.has(s)) return undefined;
    const output = this.resolveNodeName(s.node, 'The output');
    if (output !== 'in') return output;
    this.sink.error('reference', 'The output cannot be the driven input `in`.', tokenRange(s.node));
    return undefined;
  }

  /** What every statement adds, in text order. */
  private buildStatements(): PartLists {
    const parts = emptyParts();
    for (const s of this.scope.design.statements) appendParts(parts, this.statementParts(s));
    return parts;
  }

  private statementParts(s: Statement): Built {
    // A corner takes over what the nominal model built from a statement its overrides cannot reach.
    const nominal = this.reuse?.get(s);
    if (nominal && !this.affects(s)) return nominal;
    const made = this.scope.skipped.has(s) ? NOTHING : kindOf(s).build(s, this);
    this.produced.set(s, made);
    // A statement that builds in the nominal model but not in this corner leaves the corner incomplete.
    if (nominal && countParts(made) < countParts(nominal)) this.incomplete = true;
    return made;
  }

  private listParams(): Param[] {
    const params: Param[] = [];
    for (const [name, s] of this.scope.params) {
      if (this.scope.skipped.has(s) && !this.overrides.params.has(name)) continue;
      const q = this.param(name);
      if (!q) continue;
      const override = this.overrides.params.get(name);
      const written = s.fields[0]!;
      const fieldOrigin: FieldOrigin = override
        ? { range: override.expr.range, text: override.text }
        : { range: written.expr.range, text: written.text };
      const free = s.free ? this.freeRange(s as StatementOf<'param'>, q, written.expr) : undefined;
      params.push({
        name,
        value: q.value,
        dimension: dimensionName(q.dim),
        origin: this.origin(s, { value: fieldOrigin }),
        ...(free ? { free } : {}),
      });
    }
    return params;
  }

  /**
   * The bounds of a free parameter: the same kind of quantity as its value (a plain 0 fits any), low below
   * high. The value itself must be one number, since the solve rewrites it.
   */
  private freeRange(s: StatementOf<'param'>, q: Quantity, valueExpr: Expr): FreeRange | undefined {
    const low = this.quantity(s, 'low');
    const high = this.quantity(s, 'high');
    if (!low || !high || !s.free) return undefined;
    const lowExpr = s.fields.find((f) => f.name === 'low')!.expr;
    const highExpr = s.fields.find((f) => f.name === 'high')!.expr;
    const range = { start: s.free.range.start, end: highExpr.range.end };
    const own = dimensionName(q.dim);
    for (const [b, e] of [
      [low, lowExpr],
      [high, highExpr],
    ] as const) {
      if (b.dimension !== own && !(b.value === 0 && b.dimension === '1')) {
        this.sink.error(
          'unit',
          `A bound of ${quote(s.name!.text)} must be ${describeDimension(q.dim)} like its value; this is ${b.dimension === '1' ? 'a plain number' : b.dimension}.`,
          e.range,
        );
        return undefined;
      }
    }
    if (!(low.value < high.value)) {
      this.sink.error(
        'syntax',
        `The lower bound of ${quote(s.name!.text)} must be below the upper bound.`,
        range,
      );
      return undefined;
    }
    if (valueExpr.kind !== 'number') {
      this.sink.error(
        'syntax',
        `A free parameter is written as one number (the solve rewrites it): \`param ${s.name!.text} = 1 pF free …\`. Derive other values from it instead.`,
        valueExpr.range,
      );
      return undefined;
    }
    if (q.value < low.value || q.value > high.value)
      this.sink.warning(
        'plausibility',
        `${quote(s.name!.text)} lies outside its free range; the solve starts from the nearest bound.`,
        valueExpr.range,
      );
    return { low: low.value, high: high.value, range };
  }

  nominalDimensions(): Map<string, Dimension> {
    const out = new Map<string, Dimension>();
    for (const [name, state] of this.paramState) if (state && state !== 'visiting') out.set(name, state.dim);
    return out;
  }
}

/** The parameters a corner's overrides can change: the overridden ones and all that depend on them. */
function paramsReachedBy(scope: DesignScope, overrides: Overrides): Set<string> {
  const reached = new Set(overrides.params.keys());
  if (!reached.size) return reached;
  const deps = [...scope.params].map(([name, st]) => {
    const refs = new Set<string>();
    for (const f of st.fields) forEachRef(f.expr, (r) => refs.add(r));
    return [name, refs] as const;
  });
  for (let changed = true; changed;) {
    changed = false;
    for (const [name, refs] of deps) {
      if (reached.has(name)) continue;
      for (const r of refs)
        if (reached.has(r)) {
          reached.add(name);
          changed = true;
          break;
        }
    }
  }
  return reached;
}
