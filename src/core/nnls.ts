/**
 * Non-negative least squares, min ||A x - b||_2 subject to x >= 0, by the
 * active-set algorithm of Lawson & Hanson (Solving Least Squares Problems,
 * Prentice-Hall 1974, ch. 23). Dense and small: a handful of sources.
 */

function solveLeastSquares(
  A: readonly (readonly number[])[],
  b: readonly number[],
  cols: readonly number[],
): number[] {
  // normal equations on the passive columns, solved by Gaussian elimination with partial pivoting
  const k = cols.length;
  const M: number[][] = Array.from({ length: k }, () => new Array<number>(k + 1).fill(0));
  for (let p = 0; p < k; p++) {
    for (let q = 0; q < k; q++) {
      let s = 0;
      for (let r = 0; r < A.length; r++) s += A[r][cols[p]] * A[r][cols[q]];
      M[p][q] = s;
    }
    let s = 0;
    for (let r = 0; r < A.length; r++) s += A[r][cols[p]] * b[r];
    M[p][k] = s;
  }
  for (let c = 0; c < k; c++) {
    let piv = c;
    for (let r = c + 1; r < k; r++) if (Math.abs(M[r][c]) > Math.abs(M[piv][c])) piv = r;
    [M[c], M[piv]] = [M[piv], M[c]];
    const d = M[c][c];
    if (Math.abs(d) < 1e-300)
      throw new Error('nnls: singular system (two sources supply the same gases in the same ratio)');
    for (let r = 0; r < k; r++) {
      if (r === c) continue;
      const f = M[r][c] / d;
      for (let q = c; q <= k; q++) M[r][q] -= f * M[c][q];
    }
  }
  return M.map((row, i) => row[k] / row[i]);
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
  const res = b.map((bi, i) => A[i].reduce((s, a, j) => s + a * x[j], 0) - bi);
  return { x, residualNorm: Math.hypot(...res) };
}
