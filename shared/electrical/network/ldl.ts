/**
 * Sparse LDLᵀ factorization of a symmetric positive-definite matrix (the nodal conductance matrix),
 * with a minimum-degree fill-reducing ordering. Symbolic analysis builds the elimination tree and the
 * column counts of L; the numeric factorization is the up-looking row-by-row LDLᵀ (each row's pattern
 * found by walking the elimination tree). The ordering is exact minimum degree on an explicit
 * elimination graph, which is cheap for the low-fill graphs of battery banks and DC distribution.
 */

/** Symmetric matrix in compressed sparse column form with both triangles stored (diagonal included). */
export interface SymmetricCsc {
  n: number;
  colPtr: Int32Array;
  rowIdx: Int32Array;
}

/**
 * Minimum-degree ordering: repeatedly eliminates a node of least degree in the elimination graph
 * (ties: most recently updated first), joining its neighbours into a clique. Adjacency lists live in
 * one Int32Array pool (each list a slice with spare room, moved to the end of the pool when it
 * outgrows it) and are cleaned lazily; eliminating a node with a single neighbour (a leaf, e.g. a
 * battery post on a busbar) only decrements that neighbour's degree, so stars cost O(n), not O(n²).
 * Returns order[k] = the k-th pivot.
 */
export function minimumDegreeOrder(a: SymmetricCsc): Int32Array {
  const { n, colPtr, rowIdx } = a;
  const start = new Int32Array(n);
  const len = new Int32Array(n);
  const cap = new Int32Array(n);
  const stamp = new Int32Array(n).fill(-1);
  let pool = new Int32Array(Math.max(16, 2 * colPtr[n] + 2 * n));
  let top = 0;
  for (let j = 0; j < n; j++) {
    start[j] = top;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      if (i !== j && stamp[i] !== j) {
        stamp[i] = j;
        pool[top++] = i;
      }
    }
    len[j] = top - start[j];
    cap[j] = 2 * len[j] + 2;
    top = start[j] + cap[j];
  }
  const deg = len.slice();
  const eliminated = new Uint8Array(n);
  // Degree buckets as doubly linked lists.
  const head = new Int32Array(n + 1).fill(-1);
  const next = new Int32Array(n).fill(-1);
  const prev = new Int32Array(n).fill(-1);
  const insert = (i: number) => {
    const d = deg[i];
    prev[i] = -1;
    next[i] = head[d];
    if (head[d] !== -1) prev[head[d]] = i;
    head[d] = i;
  };
  const remove = (i: number) => {
    if (prev[i] !== -1) next[prev[i]] = next[i];
    else head[deg[i]] = next[i];
    if (next[i] !== -1) prev[next[i]] = prev[i];
  };
  for (let i = n - 1; i >= 0; i--) insert(i);
  stamp.fill(-1);
  let mark = -1;
  const order = new Int32Array(n);
  const nb = new Int32Array(n);
  let minDeg = 0;
  for (let k = 0; k < n; k++) {
    while (head[minDeg] === -1) minDeg++;
    const p = head[minDeg];
    remove(p);
    order[k] = p;
    eliminated[p] = 1;
    let d = 0;
    for (let q = start[p], e = start[p] + len[p]; q < e; q++) {
      const u = pool[q];
      if (!eliminated[u]) nb[d++] = u;
    }
    len[p] = 0;
    if (d === 1) {
      const u = nb[0];
      remove(u);
      deg[u]--;
      insert(u);
      if (deg[u] < minDeg) minDeg = deg[u];
      continue;
    }
    for (let t = 0; t < d; t++) {
      const u = nb[t];
      // adj[u] := live neighbours of u, plus the other members of nb (deduplicated by a fresh mark).
      const tag = ++mark;
      stamp[u] = tag;
      let su = start[u];
      let l = 0;
      for (let r = su, e = su + len[u]; r < e; r++) {
        const w = pool[r];
        if (!eliminated[w] && stamp[w] !== tag) {
          stamp[w] = tag;
          pool[su + l++] = w;
        }
      }
      if (l + d > cap[u]) {
        const c = Math.max(2 * cap[u], l + d);
        if (top + c > pool.length) {
          const bigger = new Int32Array(Math.max(2 * pool.length, top + c));
          bigger.set(pool.subarray(0, top));
          pool = bigger;
        }
        pool.copyWithin(top, su, su + l);
        start[u] = su = top;
        cap[u] = c;
        top += c;
      }
      for (let r = 0; r < d; r++) {
        const w = nb[r];
        if (stamp[w] !== tag) {
          stamp[w] = tag;
          pool[su + l++] = w;
        }
      }
      len[u] = l;
      remove(u);
      deg[u] = l;
      insert(u);
      if (l < minDeg) minDeg = l;
    }
  }
  return order;
}

/** Symbolic analysis (ordering, elimination tree, column counts) reusable for any values on the pattern. */
export class LdlFactor {
  readonly n: number;
  readonly perm: Int32Array; // perm[k] = original index of pivot k
  readonly pinv: Int32Array;
  readonly parent: Int32Array;
  readonly Lp: Int32Array;
  readonly Li: Int32Array;
  readonly Lx: Float64Array;
  readonly D: Float64Array;
  private readonly a: SymmetricCsc;
  private readonly lnz: Int32Array;
  private readonly flag: Int32Array;
  private readonly pattern: Int32Array;
  private readonly y: Float64Array;
  private readonly work: Float64Array;

  constructor(a: SymmetricCsc, perm: Int32Array = minimumDegreeOrder(a)) {
    const n = a.n;
    this.n = n;
    this.a = a;
    this.perm = perm;
    this.pinv = new Int32Array(n);
    for (let k = 0; k < n; k++) this.pinv[perm[k]] = k;
    this.parent = new Int32Array(n);
    this.lnz = new Int32Array(n);
    this.flag = new Int32Array(n);
    const { parent, lnz, flag, pinv } = this;
    for (let k = 0; k < n; k++) {
      parent[k] = -1;
      flag[k] = k;
      lnz[k] = 0;
      const kk = perm[k];
      for (let p = a.colPtr[kk]; p < a.colPtr[kk + 1]; p++) {
        let i = pinv[a.rowIdx[p]];
        if (i < k) {
          for (; flag[i] !== k; i = parent[i]) {
            if (parent[i] === -1) parent[i] = k;
            lnz[i]++;
            flag[i] = k;
          }
        }
      }
    }
    this.Lp = new Int32Array(n + 1);
    for (let k = 0; k < n; k++) this.Lp[k + 1] = this.Lp[k] + lnz[k];
    this.Li = new Int32Array(this.Lp[n]);
    this.Lx = new Float64Array(this.Lp[n]);
    this.D = new Float64Array(n);
    this.pattern = new Int32Array(n);
    this.y = new Float64Array(n);
    this.work = new Float64Array(n);
  }

  /** Non-zeros of L (excluding the unit diagonal). */
  get nnzL(): number {
    return this.Lp[this.n];
  }

  /**
   * Numeric factorization for values `ax` on the pattern. Returns -1 on success, or the original index
   * of the first pivot that is not positive (relative to its diagonal): the matrix is singular there.
   */
  factor(ax: Float64Array): number {
    const { n, a, perm, pinv, parent, lnz, flag, pattern, y, Lp, Li, Lx, D } = this;
    for (let k = 0; k < n; k++) {
      y[k] = 0;
      let top = n;
      flag[k] = k;
      lnz[k] = 0;
      const kk = perm[k];
      let diag = 0;
      for (let p = a.colPtr[kk]; p < a.colPtr[kk + 1]; p++) {
        let i = pinv[a.rowIdx[p]];
        if (i <= k) {
          y[i] += ax[p];
          if (i === k) diag += ax[p];
          let len = 0;
          for (; flag[i] !== k; i = parent[i]) {
            pattern[len++] = i;
            flag[i] = k;
          }
          while (len > 0) pattern[--top] = pattern[--len];
        }
      }
      let dk = y[k];
      y[k] = 0;
      for (; top < n; top++) {
        const i = pattern[top];
        const yi = y[i];
        y[i] = 0;
        const p2 = Lp[i] + lnz[i];
        for (let p = Lp[i]; p < p2; p++) y[Li[p]] -= Lx[p] * yi;
        const lki = yi / D[i];
        dk -= lki * yi;
        Li[p2] = k;
        Lx[p2] = lki;
        lnz[i]++;
      }
      if (!(dk > 1e-14 * Math.abs(diag))) return kk;
      D[k] = dk;
    }
    return -1;
  }

  /** Solves A x = b for the last factorized values. `x` may be `b`. */
  solve(b: ArrayLike<number>, x: Float64Array = new Float64Array(this.n)): Float64Array {
    const { n, perm, work: w } = this;
    for (let k = 0; k < n; k++) w[k] = b[perm[k]];
    this.solvePermuted(w);
    for (let k = 0; k < n; k++) x[perm[k]] = w[k];
    return x;
  }

  /**
   * Solves A x = b in place in the factor's own pivot order: on entry w[k] is entry perm[k] of b, on
   * return entry perm[k] of x. `from`: entries of w before it are zero (a sparse right-hand side, e.g.
   * the two ends of one branch), so the forward solve starts there.
   */
  solvePermuted(w: Float64Array, from = 0): Float64Array {
    const { n, Lp, Li, Lx, D } = this;
    for (let j = from; j < n; j++) {
      const wj = w[j];
      if (wj !== 0) for (let p = Lp[j], e = Lp[j + 1]; p < e; p++) w[Li[p]] -= Lx[p] * wj;
    }
    for (let j = n - 1; j >= 0; j--) {
      let wj = w[j] / D[j];
      for (let p = Lp[j], e = Lp[j + 1]; p < e; p++) wj -= Lx[p] * w[Li[p]];
      w[j] = wj;
    }
    return w;
  }

  /**
   * `solvePermuted` for four right-hand sides at once, interleaved: w[4k + r] is entry perm[k] of
   * right-hand side r. Each one gets exactly the arithmetic of its own `solvePermuted`; the matrix
   * indices are read once for all four.
   */
  solvePermuted4(w: Float64Array, from = 0): Float64Array {
    const { n, Lp, Li, Lx, D } = this;
    for (let j = from; j < n; j++) {
      const q = 4 * j;
      const a0 = w[q];
      const a1 = w[q + 1];
      const a2 = w[q + 2];
      const a3 = w[q + 3];
      if (a0 === 0 && a1 === 0 && a2 === 0 && a3 === 0) continue;
      for (let p = Lp[j], e = Lp[j + 1]; p < e; p++) {
        const l = Lx[p];
        const t = 4 * Li[p];
        w[t] -= l * a0;
        w[t + 1] -= l * a1;
        w[t + 2] -= l * a2;
        w[t + 3] -= l * a3;
      }
    }
    for (let j = n - 1; j >= 0; j--) {
      const d = D[j];
      const q = 4 * j;
      let a0 = w[q] / d;
      let a1 = w[q + 1] / d;
      let a2 = w[q + 2] / d;
      let a3 = w[q + 3] / d;
      for (let p = Lp[j], e = Lp[j + 1]; p < e; p++) {
        const l = Lx[p];
        const t = 4 * Li[p];
        a0 -= l * w[t];
        a1 -= l * w[t + 1];
        a2 -= l * w[t + 2];
        a3 -= l * w[t + 3];
      }
      w[q] = a0;
      w[q + 1] = a1;
      w[q + 2] = a2;
      w[q + 3] = a3;
    }
    return w;
  }
}

/** Solves the small dense system A x = b (row-major k x k) by LU with partial pivoting; null if singular. */
export function denseSolve(A: Float64Array, b: Float64Array, k: number): Float64Array | null {
  const m = Float64Array.from(A);
  const x = Float64Array.from(b);
  for (let c = 0; c < k; c++) {
    let piv = c;
    for (let r = c + 1; r < k; r++) if (Math.abs(m[r * k + c]) > Math.abs(m[piv * k + c])) piv = r;
    const pv = m[piv * k + c];
    if (!(Math.abs(pv) > 1e-300) || !Number.isFinite(pv)) return null;
    if (piv !== c) {
      for (let j = 0; j < k; j++) {
        const t = m[c * k + j];
        m[c * k + j] = m[piv * k + j];
        m[piv * k + j] = t;
      }
      const t = x[c];
      x[c] = x[piv];
      x[piv] = t;
    }
    for (let r = c + 1; r < k; r++) {
      const f = m[r * k + c] / pv;
      if (f === 0) continue;
      for (let j = c; j < k; j++) m[r * k + j] -= f * m[c * k + j];
      x[r] -= f * x[c];
    }
  }
  for (let r = k - 1; r >= 0; r--) {
    let s = x[r];
    for (let j = r + 1; j < k; j++) s -= m[r * k + j] * x[j];
    x[r] = s / m[r * k + r];
  }
  for (let i = 0; i < k; i++) if (!Number.isFinite(x[i])) return null;
  return x;
}
