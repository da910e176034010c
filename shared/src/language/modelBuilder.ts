// One evaluation of a design into a DesignModel: the nominal one, or one corner with its overrides. Errors
// are reported where they are made, once: a statement that fails adds nothing to the model, and whatever
// depends on it stays silent.
import { si, type Amperes, type Farads, type Ohms } from '../units';
import { CornerReporter, quote, type Reporter } from './diagnostics';
import { node, type DesignScope, type StatementOf } from './designScope';
import { evaluate, type Quantity, type Related } from './evaluateExpression';
import { forEachRef, walkExpr, type Expr } from './expression';
import { spanRange, tokenRange, type Token } from './lexer';
import type {
  BufferedCap,
  DesignModel,
  Element,
  FieldOrigin,
  Load,
  Miller,
  NodeDecl,
  NodeName,
  NodeRef,
  Origin,
  Param,
  Requirement,
  Stage,
} from './model';
import type { Overrides } from './overrides';
import { checkValue, type ViaParam } from './plausibility';
import type { SourceRange } from './source';
import type { Statement } from './syntax';
import {
  DIM,
  describeDimension,
  dimensionName,
  isDimensionless,
  lookupUnit,
  sameDimension,
  type Dimension,
  type NamedDimension,
} from './unitTable';
import type { ValueRole } from './valueRanges';
import { closest, REQUIRED_FIELDS, REQUIREMENT_DIMENSIONS } from './vocabulary';

interface Produced {
  readonly stages: readonly Stage[];
  readonly loads: readonly Load[];
  readonly millers: readonly Miller[];
  readonly buffered: readonly BufferedCap[];
  readonly elements: readonly Element[];
  readonly requirements: readonly Requirement[];
}

const count = (p: Produced): number =>
  p.stages.length +
  p.loads.length +
  p.millers.length +
  p.buffered.length +
  p.elements.length +
  p.requirements.length;

type FieldResult =
  | { readonly status: 'absent' }
  | { readonly status: 'failed' }
  | { readonly status: 'ok'; readonly value: number; readonly origin: FieldOrigin };

/** One evaluation of a design: nominal, or one corner. */
export class ModelBuilder {
  private readonly paramState = new Map<string, Quantity | null | 'visiting'>();
  private readonly stack: string[] = [];
  private readonly cycleMembers = new Set<string>();
  /** Set when this corner cannot give a complete model (an override failed, or a statement broke). */
  incomplete = false;

  /** The nominal parameter dimensions, for checking corner overrides. */
  private readonly nominalDims?: ReadonlyMap<string, Dimension>;
  /** The nominal model's statements, for a corner. */
  private readonly reuse?: ReadonlyMap<Statement, Produced>;
  private readonly nominalBuiltBeta: boolean;
  /** True when a `feedback` statement gave this model its beta. */
  builtBeta = false;
  /** What each statement added to this model, so that corners can take over what they do not change. */
  readonly produced = new Map<Statement, Produced>();
  /** Parameters whose value this corner may change: the overridden ones and all that depend on them. */
  private readonly affectedParams = new Set<string>();

  constructor(
    readonly scope: DesignScope,
    readonly overrides: Overrides,
    /** For a corner: the nominal evaluation, already built. */
    nominal?: ModelBuilder,
    corner?: StatementOf<'corner'>,
  ) {
    this.nominalDims = nominal?.nominalDimensions();
    this.reuse = nominal?.produced;
    this.nominalBuiltBeta = nominal?.builtBeta ?? false;
    this.sink =
      corner?.name !== undefined
        ? new CornerReporter(scope.sink, corner.name.text, corner.range, tokenRange(corner.name))
        : scope.sink;
    for (const name of overrides.params.keys()) this.affectedParams.add(name);
    if (!this.affectedParams.size) return;
    const deps = [...scope.params].map(([name, st]) => {
      const refs = new Set<string>();
      for (const f of st.fields) forEachRef(f.expr, (r) => refs.add(r));
      return [name, refs] as const;
    });
    for (let changed = true; changed;) {
      changed = false;
      for (const [name, refs] of deps) {
        if (this.affectedParams.has(name)) continue;
        for (const r of refs)
          if (this.affectedParams.has(r)) {
            this.affectedParams.add(name);
            changed = true;
            break;
          }
      }
    }
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

  field(
    s: Statement,
    name: string,
    dimName: NamedDimension,
    role: ValueRole,
    displayName = name,
  ): FieldResult {
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
    const { scope, sink } = this;
    const design = scope.design;
    const live = (s: Statement): boolean => !scope.skipped.has(s);

    // Nodes, in text order: the input, then every stage and declared node, then `out` when only mentioned.
    const nodes: NodeDecl[] = [];
    const inMention = scope.nodeRefs.find((t) => t.text === 'in');
    nodes.push({ name: node('in'), kind: 'input', ...(inMention ? { range: tokenRange(inMention) } : {}) });
    for (const d of scope.decls.values())
      if (d.kind !== 'param')
        nodes.push({
          name: node(d.token.text),
          kind: d.kind === 'stage' ? 'stage' : 'declared',
          range: tokenRange(d.token),
        });
    if (scope.mentionsOut()) {
      const first = scope.nodeRefs.find((t) => t.text === 'out')!;
      nodes.push({ name: node('out'), kind: 'output', range: tokenRange(first) });
    }

    // The output: named, else the last stage, else `out` when the text uses it.
    const outputs = design.statements.filter((s): s is StatementOf<'output'> => s.kind === 'output');
    outputs
      .slice(1)
      .forEach((s) =>
        sink.error('syntax', '`output` is given twice; the first one is used.', tokenRange(s.keyword), [
          { range: tokenRange(outputs[0]!.keyword), message: 'first `output`' },
        ]),
      );
    let output: NodeName | undefined;
    const outStmt = outputs[0];
    // Without an output there is no model, but every statement is still evaluated so that all of its
    // mistakes are reported.
    if (outStmt) {
      if (outStmt.node && live(outStmt)) output = this.resolveNodeName(outStmt.node, 'The output');
      if (output === 'in') {
        sink.error('reference', 'The output cannot be the driven input `in`.', tokenRange(outStmt.node!));
        output = undefined;
      }
    } else if (scope.stages.length) output = node(scope.stages[scope.stages.length - 1]!.name!.text);
    else if (scope.mentionsOut() || scope.decls.get('out')?.kind === 'node') output = node('out');
    else {
      sink.error(
        'reference',
        `Design ${quote(design.name)} has no stage and names no output: add \`output NODE\`.`,
        design.nameToken ? tokenRange(design.nameToken) : tokenRange(design.keyword),
      );
    }

    const stages: Stage[] = [];
    const loads: Load[] = [];
    const millers: Miller[] = [];
    const buffered: BufferedCap[] = [];
    const elements: Element[] = [];
    const requirements: Requirement[] = [];
    let beta = 1;
    let betaOrigin: Origin | undefined;
    let feedbackSeen: Statement | undefined;

    /** Evaluates the listed fields; reports missing required ones; undefined when any failed. */
    const fieldsOf = (
      s: Statement,
      specs: readonly [string, NamedDimension, ValueRole][],
      kind = s.kind,
    ): { values: Record<string, number>; origins: Record<string, FieldOrigin> } | undefined => {
      const values: Record<string, number> = {};
      const origins: Record<string, FieldOrigin> = {};
      let ok = true;
      const missing: string[] = [];
      for (const [name, dim, role] of specs) {
        const r = this.field(s, name, dim, role);
        if (r.status === 'ok') {
          values[name] = r.value;
          origins[name] = r.origin;
        } else if (r.status === 'failed') ok = false;
        else if (REQUIRED_FIELDS[kind]?.includes(name)) missing.push(name);
      }
      if (missing.length) {
        const blame = 'name' in s && s.name ? spanRange(s.keyword, s.name) : tokenRange(s.keyword);
        sink.error(
          'syntax',
          `${quote(kind)} needs ${missing.map((m) => quote(`${m} = …`)).join(' and ')}.`,
          blame,
        );
        ok = false;
      }
      return ok ? { values, origins } : undefined;
    };

    let previous: NodeName = node('in');
    let prev: NodeName = previous;
    const handle = (s: Statement): void => {
      if (s.kind === 'stage') {
        const own = s.name && scope.decls.get(s.name.text)?.statement === s ? node(s.name.text) : undefined;
        if (!live(s) || !own) return;
        const input: NodeRef | undefined = s.from ? this.resolveNode(s.from) : { kind: 'node', name: prev };
        const f = fieldsOf(s, [
          ['gm', 'S', 'gm-stage'],
          ['rout', 'ohm', 'rout'],
          ['cap', 'F', 'cap'],
          ['bias', 'A', 'bias'],
        ]);
        if (!f || !input) return;
        stages.push({
          name: own,
          input,
          gm: si(f.values.gm!),
          rout: si(f.values.rout!),
          cap: si(f.values.cap ?? 0),
          polarity: s.polarity?.value ?? 'noninverting',
          ...(f.values.bias !== undefined ? { bias: si<Amperes>(f.values.bias) } : {}),
          origin: this.origin(s, f.origins),
        });
        return;
      }
      if (!live(s)) return;
      switch (s.kind) {
        case 'load': {
          const at = s.at ? this.resolveNodeName(s.at, 'A load') : output;
          const f = fieldsOf(s, [
            ['cap', 'F', 'cap-board'],
            ['res', 'ohm', 'res'],
          ]);
          if (!f || !at) break;
          if (f.values.cap === undefined && f.values.res === undefined && !s.fields.length) {
            sink.error('syntax', '`load` needs `cap = …` or `res = …`.', tokenRange(s.keyword));
            break;
          }
          loads.push({
            node: at,
            ...(f.values.cap !== undefined ? { cap: si<Farads>(f.values.cap) } : {}),
            ...(f.values.res !== undefined ? { res: si<Ohms>(f.values.res) } : {}),
            origin: this.origin(s, f.origins),
          });
          break;
        }
        case 'miller':
        case 'indirect': {
          const from = s.from && this.resolveNodeName(s.from, `A ${s.kind} capacitor's node`);
          const to = s.to && this.resolveNodeName(s.to, `A ${s.kind} capacitor's node`);
          const f =
            s.kind === 'miller'
              ? fieldsOf(s, [
                  ['cc', 'F', 'cap'],
                  ['rz', 'ohm', 'rz'],
                ])
              : fieldsOf(s, [
                  ['cc', 'F', 'cap'],
                  ['gm', 'S', 'gm-buffer'],
                  ['cap', 'F', 'cap'],
                ]);
          if (!f || !from || !to) break;
          if (from === to) {
            sink.error('reference', `${quote(s.kind)} needs two different nodes.`, spanRange(s.from!, s.to!));
            break;
          }
          if (s.kind === 'miller')
            millers.push({
              from,
              to,
              cc: si(f.values.cc!),
              ...(f.values.rz !== undefined ? { rz: si<Ohms>(f.values.rz) } : {}),
              origin: this.origin(s, f.origins),
            });
          else
            buffered.push({
              from,
              to,
              cc: si(f.values.cc!),
              gm: si(f.values.gm!),
              ...(f.values.cap !== undefined ? { cap: si<Farads>(f.values.cap) } : {}),
              origin: this.origin(s, f.origins),
            });
          break;
        }
        case 'feedforward': {
          const control = s.from && this.resolveNode(s.from);
          const out = s.to && this.resolveNode(s.to);
          const f = fieldsOf(s, [['gm', 'S', 'gm']]);
          if (!f || !control || !out) break;
          elements.push({
            kind: 'gm',
            control,
            output: out,
            value: si(f.values.gm!),
            polarity: s.polarity?.value ?? 'noninverting',
            origin: this.origin(s, f.origins),
          });
          break;
        }
        case 'element': {
          if (!s.element || !s.a || !s.b) break;
          const a = this.resolveNode(s.a);
          const b = this.resolveNode(s.b);
          const spec: [string, NamedDimension, ValueRole] =
            s.element === 'res'
              ? ['value', 'ohm', 'res']
              : s.element === 'cap'
                ? ['value', 'F', 'cap-board']
                : ['value', 'S', 'gm'];
          const r = this.field(s, 'value', spec[1], spec[2], `element ${s.element}`);
          if (r.status !== 'ok' || !a || !b) break;
          const origin = this.origin(s, { value: r.origin });
          const same = a.kind === b.kind && (a.kind === 'ground' || (b.kind === 'node' && a.name === b.name));
          if (same && s.element !== 'gm') {
            sink.error(
              'reference',
              `This ${s.element === 'res' ? 'resistor' : 'capacitor'} connects a node to itself.`,
              spanRange(s.a, s.b),
            );
            break;
          }
          if (s.element === 'res') elements.push({ kind: 'res', a, b, value: si(r.value), origin });
          else if (s.element === 'cap') elements.push({ kind: 'cap', a, b, value: si(r.value), origin });
          else
            elements.push({
              kind: 'gm',
              control: a,
              output: b,
              value: si(r.value),
              polarity: s.polarity?.value ?? 'noninverting',
              origin,
            });
          break;
        }
        case 'feedback': {
          if (feedbackSeen) {
            sink.error('syntax', '`feedback` is given twice; the first one is used.', tokenRange(s.keyword), [
              { range: tokenRange(feedbackSeen.keyword), message: 'first `feedback`' },
            ]);
            break;
          }
          feedbackSeen = s;
          const f = fieldsOf(s, [['beta', 'one', 'beta']]);
          if (!f) break;
          beta = f.values.beta!;
          betaOrigin = this.origin(s, f.origins);
          break;
        }
        case 'require': {
          const req = this.requirement(s);
          if (req) requirements.push(req);
          break;
        }
        default:
          break;
      }
    };

    for (const s of design.statements) {
      if (s.kind === 'stage') {
        // The default input is the stage before, even if that stage itself has an error.
        prev = previous;
        if (s.name && scope.decls.get(s.name.text)?.statement === s) previous = node(s.name.text);
      }
      // A corner takes over what the nominal model built from a statement its overrides cannot reach.
      const nominal = this.reuse?.get(s);
      if (nominal && s.kind !== 'feedback' && !this.affects(s)) {
        stages.push(...nominal.stages);
        loads.push(...nominal.loads);
        millers.push(...nominal.millers);
        buffered.push(...nominal.buffered);
        elements.push(...nominal.elements);
        requirements.push(...nominal.requirements);
        continue;
      }
      const mark = [
        stages.length,
        loads.length,
        millers.length,
        buffered.length,
        elements.length,
        requirements.length,
      ];
      handle(s);
      const made: Produced = {
        stages: stages.slice(mark[0]),
        loads: loads.slice(mark[1]),
        millers: millers.slice(mark[2]),
        buffered: buffered.slice(mark[3]),
        elements: elements.slice(mark[4]),
        requirements: requirements.slice(mark[5]),
      };
      this.produced.set(s, made);
      // A statement that builds in the nominal model but not in this corner leaves the corner incomplete.
      if (nominal && count(made) < count(nominal)) this.incomplete = true;
    }

    const params: Param[] = [];
    for (const [name, s] of scope.params) {
      if (scope.skipped.has(s) && !this.overrides.params.has(name)) continue;
      const q = this.param(name);
      if (!q) continue;
      const override = this.overrides.params.get(name);
      const written = s.fields[0]!;
      const fieldOrigin: FieldOrigin = override
        ? { range: override.expr.range, text: override.text }
        : { range: written.expr.range, text: written.text };
      params.push({
        name,
        value: q.value,
        dimension: dimensionName(q.dim),
        origin: this.origin(s, { value: fieldOrigin }),
      });
    }

    this.builtBeta = betaOrigin !== undefined;
    if (this.nominalBuiltBeta && !this.builtBeta) this.incomplete = true;
    if (!output) return undefined;
    return {
      name: design.name,
      nodes,
      input: node('in'),
      output,
      stages,
      loads,
      millers,
      buffered,
      elements,
      beta: si(beta),
      ...(betaOrigin ? { betaOrigin } : {}),
      requirements,
      params,
    };
  }

  private requirement(s: StatementOf<'require'>): Requirement | undefined {
    const kind = s.requirement;
    if (!kind) return undefined;
    if (kind === 'settle') {
      const tol = this.field(s, 'tolerance', 'one', 'tolerance');
      const within = this.field(s, 'within', 's', 'within');
      if (tol.status !== 'ok' || within.status !== 'ok') return undefined;
      const written =
        this.overrides.fields.get(s)?.get('tolerance')?.expr ??
        s.fields.find((f) => f.name === 'tolerance')?.expr;
      if (written?.kind === 'number' && written.unitText === undefined && tol.value >= 0.01)
        this.sink.warning(
          'plausibility',
          `A plain tolerance is a fraction: ${written.numberText} is ${Number((tol.value * 100).toPrecision(6))} %. Write ${quote(`${written.numberText} %`)} if you meant percent.`,
          written.range,
        );
      return {
        kind: 'settle',
        tolerance: si(tol.value),
        within: si(within.value),
        origin: this.origin(s, { tolerance: tol.origin, within: within.origin }),
      };
    }
    const op = s.op ?? '>=';
    if (kind === 'zero') {
      const r = this.field(s, 'factor', 'ugf', 'zero', 'zero');
      if (r.status !== 'ok') return undefined;
      return { kind: 'zero', op: '>=', factor: si(r.value), origin: this.origin(s, { factor: r.origin }) };
    }
    const role: ValueRole = kind;
    const r = this.field(s, 'value', REQUIREMENT_DIMENSIONS[kind], role, kind);
    if (r.status !== 'ok') return undefined;
    const origin = this.origin(s, { value: r.origin });
    switch (kind) {
      case 'ugf':
        return { kind, op, value: si(r.value), origin };
      case 'pm':
        return { kind, op, value: si(r.value), origin };
      case 'gainmargin':
        return { kind: 'gain-margin', op, value: si(r.value), origin };
      case 'slew':
        return { kind, op, value: si(r.value), origin };
      case 'dcgain':
        return { kind: 'dc-gain', op, value: si(r.value), origin };
    }
  }

  nominalDimensions(): Map<string, Dimension> {
    const out = new Map<string, Dimension>();
    for (const [name, state] of this.paramState) if (state && state !== 'visiting') out.set(name, state.dim);
    return out;
  }
}
