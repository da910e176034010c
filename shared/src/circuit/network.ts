// The linear network of one design in nodal form: C·v' + G·v + cIn·vin' + gIn·vin = 0, where v holds the
// voltages of every node except ground and the driven input (see docs/analysis.md for sign conventions).

export interface NetworkNode {
  readonly name: string;
  /** `internal` nodes are created by the circuit layer (a nulling resistor's midpoint, a buffer's input). */
  readonly kind: 'design' | 'internal';
  /**
   * For an internal node: a readable name tied to the statement the user wrote
   * (`miller first -> second (Rz–Cc junction)`), used wherever results are shown.
   */
  readonly label?: string;
  /**
   * For an internal node joined to a design node through the element's own series resistor (a nulling
   * resistor's junction): that design node's index. Participation of the junction is attributed to it
   * when the resistor carries little of the mode's voltage (docs/analysis.md, Participation).
   */
  readonly seriesTo?: number;
  /**
   * For a current buffer's input: the design node the buffer delivers the input current into. Its
   * participation is attributed there when the buffer passes on nearly all of a current injected at its
   * input in that mode (docs/analysis.md, Participation).
   */
  readonly currentTo?: number;
}

export interface Network {
  /** Number of unknown node voltages. */
  readonly n: number;
  readonly nodes: readonly NetworkNode[];
  /** Conductances and transconductances, row-major n×n (row = KCL of that node, current leaving). */
  readonly G: Float64Array;
  /** Capacitances, row-major n×n, symmetric positive semidefinite. */
  readonly C: Float64Array;
  /** Column of G for the input node (currents leaving each node per volt of input). */
  readonly gIn: Float64Array;
  /** Column of C for the input node. */
  readonly cIn: Float64Array;
  /** Index of the output node in `nodes`. */
  readonly output: number;
  /** Name of the driven input node (not an unknown). */
  readonly inputName: string;
  /**
   * Rank of C from the capacitor graph: nodes touched by a non-zero capacitor, less one for each group of
   * nodes joined only by capacitors among themselves (not to ground or the input). Exact for positive
   * capacitors whatever their spread, so the number of finite poles never rests on a numerical threshold.
   */
  readonly capRank: number;
  /**
   * Entry-wise sums of the magnitudes of every stamp in G and gIn. A conductance and a transconductance
   * can cancel inside one entry of G; these sums keep the scale the entry came from, so that a check of
   * G + sC against zero is relative to the elements rather than to their difference.
   */
  readonly gAbs?: Float64Array;
  readonly gInAbs?: Float64Array;
}

/** Index of a terminal in a network under construction: an unknown (≥ 0), ground, or the driven input. */
export type Terminal = number | 'ground' | 'input';

/** Accumulates stamps into G, C and the input columns. */
export class NetworkBuilder {
  readonly G: Float64Array;
  readonly C: Float64Array;
  readonly gIn: Float64Array;
  readonly cIn: Float64Array;
  readonly gAbs: Float64Array;
  readonly gInAbs: Float64Array;

  private readonly parent: Int32Array;
  private readonly touched: Uint8Array;
  /** Union-find root index n stands for ground and the input (fixed voltages). */
  constructor(readonly n: number) {
    this.parent = new Int32Array(n + 1);
    for (let i = 0; i <= n; i++) this.parent[i] = i;
    this.touched = new Uint8Array(n);
    this.G = new Float64Array(n * n);
    this.gAbs = new Float64Array(n * n);
    this.gInAbs = new Float64Array(n);
    this.C = new Float64Array(n * n);
    this.gIn = new Float64Array(n);
    this.cIn = new Float64Array(n);
  }

  /** A two-terminal admittance of value y between a and b into matrix m (G or C) with input column col. */
  private twoTerminal(m: Float64Array, col: Float64Array, a: Terminal, b: Terminal, y: number): void {
    const n = this.n;
    if (typeof a === 'number') {
      m[a * n + a] += y;
      if (typeof b === 'number') m[a * n + b] -= y;
      else if (b === 'input') col[a] -= y;
    }
    if (typeof b === 'number') {
      m[b * n + b] += y;
      if (typeof a === 'number') m[b * n + a] -= y;
      else if (a === 'input') col[b] -= y;
    }
  }

  conductance(a: Terminal, b: Terminal, g: number): void {
    this.twoTerminal(this.G, this.gIn, a, b, g);
    this.twoTerminal(this.gAbs, this.gInAbs, a, b, Math.abs(g));
  }

  capacitance(a: Terminal, b: Terminal, c: number): void {
    this.twoTerminal(this.C, this.cIn, a, b, c);
    if (c === 0) return;
    const ia = typeof a === 'number' ? a : this.n;
    const ib = typeof b === 'number' ? b : this.n;
    if (ia === ib) return;
    if (ia < this.n) this.touched[ia] = 1;
    if (ib < this.n) this.touched[ib] = 1;
    this.union(ia, ib);
  }

  private find(i: number): number {
    while (this.parent[i] !== i) {
      this.parent[i] = this.parent[this.parent[i]];
      i = this.parent[i];
    }
    return i;
  }

  private union(a: number, b: number): void {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra === rb) return;
    // Keep the fixed-voltage root as the representative.
    if (ra === this.n) this.parent[rb] = ra;
    else this.parent[ra] = rb;
  }

  /** Structural rank of C (see Network.capRank). */
  capRank(): number {
    let touched = 0;
    const floating = new Set<number>();
    const fixed = this.find(this.n);
    for (let i = 0; i < this.n; i++) {
      if (!this.touched[i]) continue;
      touched++;
      const r = this.find(i);
      if (r !== fixed) floating.add(r);
    }
    return touched - floating.size;
  }

  /** gm·v(control) injected into `output` (positive gm); a negative gm draws it out. */
  transconductance(control: Terminal, output: Terminal, gm: number): void {
    if (typeof output !== 'number') return;
    if (typeof control === 'number') {
      this.G[output * this.n + control] -= gm;
      this.gAbs[output * this.n + control] += Math.abs(gm);
    } else if (control === 'input') {
      this.gIn[output] -= gm;
      this.gInAbs[output] += Math.abs(gm);
    }
  }
}
