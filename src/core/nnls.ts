/**
 * Non-negative least squares, min ||A x - b||_2 subject to x >= 0, by the
 * active-set algorithm of Lawson & Hanson (Solving Least Squares Problems,
 * Prentice-Hall 1974, ch. 23). Dense and small: a handful of sources.
 */

/**
 * min ||A_P z - b|| over the passive columns P, by Householder QR with column pivoting and, at each
 * step, the row of largest entry in the pivot column moved to the pivot position (Powell & Reid,
 * "On applying Householder transformations to linear least squares problems", IFIP 1968/1969;
 * Cox & Higham, BIT 38 (1998) 1-22: so pivoted, Householder QR is stable for rows weighted over
 * many orders of magnitude, where the normal equations square the weights and lose the light rows).
 */
function solveLeastSquares(
  A: readonly (readonly number[])[],
  b: readonly number[],
  cols: readonly number[],
): number[] {
  const k = cols.length;
  const m = A.length;
  const M = A.map((row) => cols.map((c) => row[c]));
  const y = [...b];
  const perm = cols.map((_, j) => j);
  const norm2 = (c: number, from: number) => {
    let big = 0;
    for (let r = from; r < m; r++) big = Math.max(big, Math.abs(M[r][c]));
    if (big === 0) return 0;
    let s = 0;
    for (let r = from; r < m; r++) s += (M[r][c] / big) ** 2;
    return big * Math.sqrt(s);
  };
  const start = cols.map((_, j) => norm2(j, 0));
  for (let c = 0; c < k; c++) {
    if (c >= m) throw new Error('nnls: singular system (more sources than conditions to fix them)');
    let piv = c;
    for (let q = c + 1; q < k; q++) if (norm2(q, c) > norm2(piv, c)) piv = q;
    for (const row of M) [row[c], row[piv]] = [row[piv], row[c]];
    [perm[c], perm[piv]] = [perm[piv], perm[c]];
    let top = c;
    for (let r = c + 1; r < m; r++) if (Math.abs(M[r][c]) > Math.abs(M[top][c])) top = r;
    [M[c], M[top]] = [M[top], M[c]];
    [y[c], y[top]] = [y[top], y[c]];
    const alpha = norm2(c, c);
    // a column that adds nothing the earlier ones do not (to rounding) has no unique amount
    if (!(alpha > 64 * Number.EPSILON * start[perm[c]]))
      throw new Error('nnls: singular system (two sources supply the same gases in the same ratio)');
    // reflector v = x + sign(x_c) |x| e_c, applied to the columns right of c and to y
    const beta = M[c][c] >= 0 ? alpha : -alpha;
    const v = new Array<number>(m).fill(0);
    v[c] = M[c][c] + beta;
    for (let r = c + 1; r < m; r++) v[r] = M[r][c];
    const vv = v[c] * beta; // v.v / 2
    const reflect = (get: (r: number) => number, set: (r: number, val: number) => void) => {
      let dot = 0;
      for (let r = c; r < m; r++) dot += v[r] * get(r);
      const f = dot / vv;
      for (let r = c; r < m; r++) set(r, get(r) - f * v[r]);
    };
    for (let q = c + 1; q < k; q++)
      reflect(
        (r) => M[r][q],
        (r, val) => (M[r][q] = val),
      );
    reflect(
      (r) => y[r],
      (r, val) => (y[r] = val),
    );
    M[c][c] = -beta;
    for (let r = c + 1; r < m; r++) M[r][c] = 0;
  }
  const z = new Array<number>(k).fill(0);
  for (let c = k - 1; c >= 0; c--) {
    let s = y[c];
    for (let q = c + 1; q < k; q++) s -= M[c][q] * z[q];
    z[c] = s / M[c][c];
  }
  const out = new Array<number>(k).fill(0);
  perm.forEach((j, c) => (out[j] = z[c]));
  return out;
}

export interface NnlsResult {
  readonly x: number[];
  /** Euclidean norm of A x - b */
  readonly residualNorm: number;
}

/**
 * How a column's gradient is judged positive (the test that lets a column into the passive set).
 * 'largest-entry' (the default): above 1e-12 x max|b| x max|A|, one threshold for every column.
 * 'per-column': above the rounding noise of that column's own gradient, 1e3 x eps x
 * sum_i |A_ij| (|b_i| + sum_k |A_ik x_k|) (the floating-point error bound of A_j^T (b - A x)); for
 * rows weighted over many orders of magnitude (a priority order written as weights), where one
 * threshold set by the heaviest row hides the gradients of the lighter rows.
 */
export interface NnlsOptions {
  readonly gradientTest?: 'largest-entry' | 'per-column';
}

/** the rounding-noise bound of each column's gradient at x (NnlsOptions 'per-column') */
function gradientNoise(
  A: readonly (readonly number[])[],
  b: readonly number[],
  x: readonly number[],
): number[] {
  const rowNoise = A.map((row, i) => Math.abs(b[i]) + row.reduce((s, a, k) => s + Math.abs(a * x[k]), 0));
  return x.map(
    (_, j) => 1e3 * Number.EPSILON * A.reduce((s, row, i) => s + Math.abs(row[j]) * rowNoise[i], 0),
  );
}

export function nnls(
  A: readonly (readonly number[])[],
  b: readonly number[],
  maxIter = 200,
  options: NnlsOptions = {},
): NnlsResult {
  const n = A[0]?.length ?? 0;
  // each column to unit length: the problem in u_j = s_j x_j has the same minimiser and the same
  // signs, and the tests below (which column enters, which amount is zero) then compare like with
  // like whatever the columns' units (a trace gas's mole against the bath gas's mole)
  // a column whose norm is below TINY_COLUMN (far below any amount of gas; a subnormal number)
  // supplies nothing: scaled to unit length it would ask for an amount past the largest double,
  // so it is held at zero
  const norms = Array.from({ length: n }, (_, j) => columnNorm(A, j));
  const s = norms.map((v) => (v >= TINY_COLUMN ? v : 1));
  const As = A.map((row) => row.map((a, j) => (norms[j] >= TINY_COLUMN ? a / s[j] : 0)));
  const u = activeSet(As, b, maxIter, options);
  const x = u.map((v, j) => (norms[j] >= TINY_COLUMN ? v / s[j] : 0));
  const res = b.map((bi, i) => A[i].reduce((acc, a, j) => acc + a * x[j], 0) - bi);
  return { x, residualNorm: Math.hypot(...res) };
}

/** columns smaller than this are zero columns (the smallest normal double is 2.2e-308) */
const TINY_COLUMN = 1e-300;

function columnNorm(A: readonly (readonly number[])[], j: number): number {
  const big = A.reduce((m, row) => Math.max(m, Math.abs(row[j])), 0);
  return big === 0 ? 0 : big * Math.sqrt(A.reduce((acc, row) => acc + (row[j] / big) ** 2, 0));
}

/** the active-set iteration of Lawson & Hanson on columns of comparable size (see nnls) */
function activeSet(
  A: readonly (readonly number[])[],
  b: readonly number[],
  maxIter: number,
  options: NnlsOptions,
): number[] {
  const n = A[0]?.length ?? 0;
  const x = new Array<number>(n).fill(0);
  const passive = new Set<number>();
  const grad = (): number[] => {
    const r = b.map((bi, i) => bi - A[i].reduce((s, a, j) => s + a * x[j], 0));
    return Array.from({ length: n }, (_, j) => A.reduce((s, row, i) => s + row[j] * r[i], 0));
  };
  const scale = Math.max(1e-300, ...b.map(Math.abs));
  const tol = 1e-12 * scale * Math.max(1, ...A.flat().map(Math.abs));
  for (let iter = 0; iter < maxIter; iter++) {
    const w = grad();
    const tols = options.gradientTest === 'per-column' ? gradientNoise(A, b, x) : undefined;
    let best = -1;
    for (let j = 0; j < n; j++)
      if (!passive.has(j) && w[j] > (tols?.[j] ?? tol) && (best < 0 || w[j] > w[best])) best = j;
    if (best < 0) break;
    passive.add(best);
    for (;;) {
      const cols = [...passive].sort((p, q) => p - q);
      const z = solveLeastSquares(A, b, cols);
      if (!z.every(Number.isFinite)) throw new Error('nnls: the least-squares step is not finite');
      if (z.every((v) => v > 0)) {
        x.fill(0);
        cols.forEach((c, i) => (x[c] = z[i]));
        break;
      }
      let alpha = Infinity;
      cols.forEach((c, i) => {
        if (z[i] <= 0) alpha = Math.min(alpha, x[c] / (x[c] - z[i]));
      });
      cols.forEach((c, i) => (x[c] += alpha * (z[i] - x[c])));
      for (const c of cols)
        if (x[c] <= 1e-15 * scale) {
          x[c] = 0;
          passive.delete(c);
        }
      if (passive.size === 0) break;
    }
  }
  return x;
}
