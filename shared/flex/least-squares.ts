/**
 * Linear least squares min ‖A·x − b‖ for a small, full-column-rank A, by Householder QR.
 *
 * Formula: A = Q·R with Householder reflections applied to A and b in place; then R·x = Qᵀb by back
 * substitution. QR avoids forming AᵀA, whose condition number is the square of A's.
 * Callers decide identifiability first (geometry of the gauge points); a zero pivot here is a
 * programming error, not bad user input. Complexity O(n·p²).
 * Source: Golub & Van Loan, Matrix Computations (4th ed.), §5.1–5.3.
 *
 * Example: leastSquares([[1, 0], [1, 1], [1, 2]], [1, 3, 5]) // => [1, 2]
 */
export function leastSquares(rows: readonly (readonly number[])[], b: readonly number[]): number[] {
  const n = rows.length;
  const p = n === 0 ? 0 : rows[0].length;
  if (n < p || p === 0) throw new Error(`leastSquares: need at least as many rows as columns, got ${n}×${p}`);
  const a = rows.map((row) => row.slice());
  const y = b.slice();
  for (let k = 0; k < p; k++) {
    let norm = 0;
    for (let i = k; i < n; i++) norm += a[i][k] * a[i][k];
    norm = Math.sqrt(norm);
    if (norm === 0) throw new Error(`leastSquares: column ${k} is dependent on the others`);
    const alpha = a[k][k] > 0 ? -norm : norm;
    const v: number[] = [];
    for (let i = k; i < n; i++) v.push(a[i][k]);
    v[0] -= alpha;
    let vv = 0;
    for (const vi of v) vv += vi * vi;
    const reflect = (get: (i: number) => number, set: (i: number, value: number) => void): void => {
      let dot = 0;
      for (let i = k; i < n; i++) dot += v[i - k] * get(i);
      const scale = (2 * dot) / vv;
      for (let i = k; i < n; i++) set(i, get(i) - scale * v[i - k]);
    };
    for (let j = k; j < p; j++) reflect((i) => a[i][j], (i, value) => (a[i][j] = value));
    reflect((i) => y[i], (i, value) => (y[i] = value));
  }
  const x = new Array<number>(p).fill(0);
  for (let k = p - 1; k >= 0; k--) {
    let sum = y[k];
    for (let j = k + 1; j < p; j++) sum -= a[k][j] * x[j];
    x[k] = sum / a[k][k];
  }
  return x;
}
