// Sparse symmetric LDLᵀ factorization with a minimum-degree ordering, on typed arrays.
//
// Why our own and not mathjs: one sparse LU with mathjs (`slu` + `lusolve`) of a 20,000-fixture
// daisy chain takes about 350 ms warm on the project machine, and the editor needs a whole
// constant-power solve (several Newton steps) of that size in ≤ 50 ms. The conductance matrix
// of a two-wire network is symmetric positive definite once ideal sources are eliminated
// (see circuit.ts), so a Cholesky-type LDLᵀ without pivoting is stable, needs half the work of
// LU, and lets the symbolic analysis (ordering, elimination tree, column counts) be done once
// and reused for every Newton step and every case. mathjs's sparse LU stays in the project as
// the independent second solve path that the tests compare against (tests/shared/engine).
//
// The numeric phase is the classic up-looking algorithm over the elimination tree (as described
// in T. A. Davis, "Direct Methods for Sparse Linear Systems", SIAM 2006, ch. 4).

export interface SymbolicFactor {
  n: number;
  /** perm[k] = original index of the k-th pivot; iperm is its inverse. */
  perm: Int32Array;
  iperm: Int32Array;
  /** Upper triangle (rows ≤ column) of the permuted matrix in compressed columns. */
  Ap: Int32Array;
  Ai: Int32Array;
  /** Elimination tree and column pointers of L. */
  parent: Int32Array;
  Lp: Int32Array;
  /** Slot in the value array for each diagonal (original index). */
  diagSlot: Int32Array;
  /** nnz of the assembled matrix upper triangle. */
  nnzA: number;
  nnzL: number;
  /** Σ over the columns of L of (entries in the column)²: the multiply-adds of one numeric
   *  factorization, up to a constant (the selected inverse costs about the same again). */
  flops: number;
}

export interface NumericFactor {
  sym: SymbolicFactor;
  Li: Int32Array;
  Lx: Float64Array;
  D: Float64Array;
}

/** A pattern builder: register the off-diagonal pairs once, get a slot for each. */
export class PatternBuilder {
  private readonly keys = new Map<number, number>();
  readonly rows: number[] = [];
  readonly cols: number[] = [];
  constructor(readonly n: number) {}
  /** Slot id for the (undirected) pair a–b, a ≠ b. */
  pair(a: number, b: number): number {
    const lo = a < b ? a : b;
    const hi = a < b ? b : a;
    const key = lo * this.n + hi;
    let id = this.keys.get(key);
    if (id === undefined) {
      id = this.rows.length;
      this.keys.set(key, id);
      this.rows.push(lo);
      this.cols.push(hi);
    }
    return id;
  }
}

/** Minimum-degree ordering on the graph of the matrix (exact degrees, explicit fill). Leaves are
 *  eliminated first, so trees and daisy chains get no fill at all; meshes get the usual
 *  minimum-degree fill. Deterministic (ties broken by index).
 *
 *  The explicit fill costs about Σ degree² set operations over the eliminated nodes, which is
 *  quadratic in the points for a densely meshed graph (a 1 MB document of 1,500 points and
 *  13,000 runs between random points spends seconds here alone). `maxWork` bounds that sum: past
 *  it the ordering stops and returns null, and the caller refuses the network. */
export function minimumDegreeOrder(n: number, rows: readonly number[], cols: readonly number[], maxWork = Infinity): Int32Array | null {
  const adj: Set<number>[] = new Array(n);
  for (let i = 0; i < n; i++) adj[i] = new Set();
  for (let e = 0; e < rows.length; e++) {
    adj[rows[e]].add(cols[e]);
    adj[cols[e]].add(rows[e]);
  }
  // Binary heap of (degree, node) with lazy deletion.
  const heapD: number[] = [];
  const heapV: number[] = [];
  const push = (d: number, v: number) => {
    let i = heapD.length;
    heapD.push(d);
    heapV.push(v);
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (heapD[p] < d || (heapD[p] === d && heapV[p] < v)) break;
      heapD[i] = heapD[p];
      heapV[i] = heapV[p];
      i = p;
    }
    heapD[i] = d;
    heapV[i] = v;
  };
  const pop = (): number => {
    const top = heapV[0];
    const d = heapD.pop()!;
    const v = heapV.pop()!;
    const size = heapD.length;
    if (size > 0) {
      let i = 0;
      for (;;) {
        const l = 2 * i + 1;
        if (l >= size) break;
        const r = l + 1;
        let c = l;
        if (r < size && (heapD[r] < heapD[l] || (heapD[r] === heapD[l] && heapV[r] < heapV[l]))) c = r;
        if (heapD[c] > d || (heapD[c] === d && heapV[c] > v)) break;
        heapD[i] = heapD[c];
        heapV[i] = heapV[c];
        i = c;
      }
      heapD[i] = d;
      heapV[i] = v;
    }
    return top;
  };
  for (let i = 0; i < n; i++) push(adj[i].size, i);
  const done = new Uint8Array(n);
  const order = new Int32Array(n);
  let k = 0;
  let work = 0;
  while (k < n) {
    const d = heapD[0];
    const v = pop();
    if (done[v] || adj[v].size !== d) continue;
    done[v] = 1;
    order[k++] = v;
    work += d * d + 1;
    if (work > maxWork) return null;
    const nb = [...adj[v]];
    for (const u of nb) adj[u].delete(v);
    for (let a = 0; a < nb.length; a++) {
      const sa = adj[nb[a]];
      for (let b = a + 1; b < nb.length; b++) {
        if (!sa.has(nb[b])) {
          sa.add(nb[b]);
          adj[nb[b]].add(nb[a]);
        }
      }
    }
    for (const u of nb) push(adj[u].size, u);
    adj[v].clear();
  }
  return order;
}

/** Minimum degree on a compressed graph: variables that always come together (the + and −
 *  terminal of one point) form a group; the groups are ordered by minimum degree and each group's
 *  variables are eliminated one after the other. The group graph of a two-wire network is its
 *  point graph, half the size with a quarter of the fill to track (each point is a 2 × 2 block),
 *  so ordering a 10,000-point grid takes a fraction of the time of ordering its 20,000
 *  terminals one by one. */
export function groupedOrder(n: number, rows: readonly number[], cols: readonly number[], groups: Int32Array, maxWork = Infinity): Int32Array | null {
  let g = 0;
  for (let i = 0; i < n; i++) if (groups[i] + 1 > g) g = groups[i] + 1;
  const seen = new Set<number>();
  const gr: number[] = [];
  const gc: number[] = [];
  for (let e = 0; e < rows.length; e++) {
    const a = groups[rows[e]];
    const b = groups[cols[e]];
    if (a === b) continue;
    const lo = a < b ? a : b;
    const hi = a < b ? b : a;
    const key = lo * g + hi;
    if (seen.has(key)) continue;
    seen.add(key);
    gr.push(lo);
    gc.push(hi);
  }
  const groupOrder = minimumDegreeOrder(g, gr, gc, maxWork);
  if (!groupOrder) return null;
  // Members of each group, in index order (counting sort).
  const start = new Int32Array(g + 1);
  for (let i = 0; i < n; i++) start[groups[i] + 1]++;
  for (let k = 0; k < g; k++) start[k + 1] += start[k];
  const members = new Int32Array(n);
  const fill = start.slice(0, g);
  for (let i = 0; i < n; i++) members[fill[groups[i]]++] = i;
  const perm = new Int32Array(n);
  let k = 0;
  for (let t = 0; t < g; t++) {
    const grp = groupOrder[t];
    for (let p = start[grp]; p < start[grp + 1]; p++) perm[k++] = members[p];
  }
  return perm;
}

/** Orders and analyses the pattern (n diagonals + the builder's pairs). Returns the symbolic
 *  factor and the slot of every registered pair in the value array, or null when the ordering
 *  needs more than `maxOrderingWork` (see minimumDegreeOrder). */
export function analyze(pattern: PatternBuilder, groups?: Int32Array, maxOrderingWork = Infinity): { sym: SymbolicFactor; pairSlot: Int32Array } | null {
  const n = pattern.n;
  const { rows, cols } = pattern;
  const perm = groups ? groupedOrder(n, rows, cols, groups, maxOrderingWork) : minimumDegreeOrder(n, rows, cols, maxOrderingWork);
  if (!perm) return null;
  const iperm = new Int32Array(n);
  for (let k = 0; k < n; k++) iperm[perm[k]] = k;
  // Count entries per permuted column of the upper triangle (row ≤ col).
  const count = new Int32Array(n);
  for (let k = 0; k < n; k++) count[k] = 1; // diagonal
  for (let e = 0; e < rows.length; e++) {
    const a = iperm[rows[e]];
    const b = iperm[cols[e]];
    count[a > b ? a : b]++;
  }
  const Ap = new Int32Array(n + 1);
  for (let k = 0; k < n; k++) Ap[k + 1] = Ap[k] + count[k];
  const nnzA = Ap[n];
  const Ai = new Int32Array(nnzA);
  const next = Ap.slice(0, n);
  const diagSlot = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    diagSlot[perm[k]] = next[k];
    Ai[next[k]++] = k;
  }
  const pairSlot = new Int32Array(rows.length);
  for (let e = 0; e < rows.length; e++) {
    const a = iperm[rows[e]];
    const b = iperm[cols[e]];
    const col = a > b ? a : b;
    const row = a > b ? b : a;
    pairSlot[e] = next[col];
    Ai[next[col]++] = row;
  }
  // Elimination tree and column counts of L.
  const parent = new Int32Array(n);
  const flag = new Int32Array(n);
  const lnz = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    parent[k] = -1;
    flag[k] = k;
    for (let p = Ap[k]; p < Ap[k + 1]; p++) {
      let i = Ai[p];
      if (i < k) {
        for (; flag[i] !== k; i = parent[i]) {
          if (parent[i] === -1) parent[i] = k;
          lnz[i]++;
          flag[i] = k;
        }
      }
    }
  }
  const Lp = new Int32Array(n + 1);
  let flops = 0;
  for (let k = 0; k < n; k++) {
    Lp[k + 1] = Lp[k] + lnz[k];
    flops += lnz[k] * lnz[k];
  }
  return {
    sym: { n, perm, iperm, Ap, Ai, parent, Lp, diagSlot, nnzA, nnzL: Lp[n], flops },
    pairSlot,
  };
}

/** Workspace reused across numeric factorizations of the same pattern. */
export function allocateNumeric(sym: SymbolicFactor): NumericFactor {
  return {
    sym,
    Li: new Int32Array(sym.nnzL),
    Lx: new Float64Array(sym.nnzL),
    D: new Float64Array(sym.n),
  };
}

const scratch = {
  n: 0,
  Y: new Float64Array(0),
  pattern: new Int32Array(0),
  flag: new Int32Array(0),
  lnz: new Int32Array(0),
};
function workspace(n: number) {
  if (scratch.n < n) {
    scratch.n = n;
    scratch.Y = new Float64Array(n);
    scratch.pattern = new Int32Array(n);
    scratch.flag = new Int32Array(n);
    scratch.lnz = new Int32Array(n);
  }
  return scratch;
}

/** Numeric LDLᵀ of the values Ax (laid out by analyze's slots). Returns -1 on success, or the
 *  permuted index of the first pivot that is not positive — the matrix is then singular or not
 *  positive definite there (a floating node, or a constant-power load past the collapse point). */
export function factorize(num: NumericFactor, Ax: Float64Array, pivotTolerance = 1e-14): number {
  const { sym, Li, Lx, D } = num;
  const { n, Ap, Ai, parent, Lp } = sym;
  const { Y, pattern, flag, lnz } = workspace(n);
  for (let k = 0; k < n; k++) {
    Y[k] = 0;
    let top = n;
    flag[k] = k;
    lnz[k] = 0;
    let diagScale = 0;
    for (let p = Ap[k]; p < Ap[k + 1]; p++) {
      let i = Ai[p];
      Y[i] += Ax[p];
      if (i === k) diagScale = Math.abs(Ax[p]);
      let len = 0;
      for (; flag[i] !== k; i = parent[i]) {
        pattern[len++] = i;
        flag[i] = k;
      }
      while (len > 0) pattern[--top] = pattern[--len];
    }
    let d = Y[k];
    Y[k] = 0;
    for (; top < n; top++) {
      const i = pattern[top];
      const yi = Y[i];
      Y[i] = 0;
      const p2 = Lp[i] + lnz[i];
      for (let p = Lp[i]; p < p2; p++) Y[Li[p]] -= Lx[p] * yi;
      const lki = yi / D[i];
      d -= lki * yi;
      Li[p2] = k;
      Lx[p2] = lki;
      lnz[i]++;
    }
    if (!(d > pivotTolerance * (diagScale > 0 ? diagScale : 1))) {
      D[k] = d;
      return k;
    }
    D[k] = d;
  }
  return -1;
}

/** Solves A x = b in place of x (original ordering) using a successful factorization. */
export function solveInto(num: NumericFactor, b: Float64Array, x: Float64Array): void {
  const { sym, Li, Lx, D } = num;
  const { n, perm, Lp } = sym;
  const { Y } = workspace(n);
  for (let k = 0; k < n; k++) Y[k] = b[perm[k]];
  for (let j = 0; j < n; j++) {
    const yj = Y[j];
    for (let p = Lp[j]; p < Lp[j + 1]; p++) Y[Li[p]] -= Lx[p] * yj;
  }
  for (let j = 0; j < n; j++) Y[j] /= D[j];
  for (let j = n - 1; j >= 0; j--) {
    let yj = Y[j];
    for (let p = Lp[j]; p < Lp[j + 1]; p++) yj -= Lx[p] * Y[Li[p]];
    Y[j] = yj;
  }
  for (let k = 0; k < n; k++) x[perm[k]] = Y[k];
  for (let k = 0; k < n; k++) Y[k] = 0;
}

/** Entries of A⁻¹ on the pattern of L (the "selected inverse", Takahashi's recurrence), so that
 *  Z_ii and Z_ij for every registered pair are available without forming the dense inverse.
 *  Returns Zdiag (permuted index) and Zx (same layout as Lx). Used for the Thevenin resistance
 *  behind every point (available fault current). Rows in each column of L are ascending. */
export function selectedInverse(num: NumericFactor): { Zdiag: Float64Array; Zx: Float64Array } {
  const { sym, Li, Lx, D } = num;
  const { n, Lp } = sym;
  const Zdiag = new Float64Array(n);
  const Zx = new Float64Array(sym.nnzL);
  const pos = new Int32Array(n).fill(-1);
  const acc = new Float64Array(n);
  for (let j = n - 1; j >= 0; j--) {
    const p0 = Lp[j];
    const p1 = Lp[j + 1];
    for (let p = p0; p < p1; p++) {
      pos[Li[p]] = p;
      acc[p - p0] = 0;
    }
    for (let p = p0; p < p1; p++) {
      const k = Li[p];
      const lk = Lx[p];
      const t = p - p0;
      acc[t] -= lk * Zdiag[k];
      for (let q = Lp[k]; q < Lp[k + 1]; q++) {
        const r = Li[q];
        const s = pos[r];
        if (s >= 0) {
          const z = Zx[q];
          acc[t] -= Lx[s] * z;
          acc[s - p0] -= lk * z;
        }
      }
    }
    let zjj = 1 / D[j];
    for (let p = p0; p < p1; p++) {
      Zx[p] = acc[p - p0];
      zjj -= Lx[p] * acc[p - p0];
      pos[Li[p]] = -1;
    }
    Zdiag[j] = zjj;
  }
  return { Zdiag, Zx };
}

/** Z entry for original indices a, b from a selected inverse (a ≠ b must be in L's pattern). */
export function selectedEntry(num: NumericFactor, Z: { Zdiag: Float64Array; Zx: Float64Array }, a: number, b: number): number {
  const { iperm, Lp } = num.sym;
  const pa = iperm[a];
  const pb = iperm[b];
  if (pa === pb) return Z.Zdiag[pa];
  const col = pa < pb ? pa : pb;
  const row = pa < pb ? pb : pa;
  let lo = Lp[col];
  let hi = Lp[col + 1] - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    const r = num.Li[mid];
    if (r === row) return Z.Zx[mid];
    if (r < row) lo = mid + 1;
    else hi = mid - 1;
  }
  return Number.NaN;
}
