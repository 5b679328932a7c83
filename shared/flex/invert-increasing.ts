/**
 * Solves f(x) = target for an increasing function f by bracketing and bisection.
 *
 * Method: start from [start − step, start + step], double the bracket outward until it holds the
 * target, then halve it until its width is below 1e-12 relative (at most ~1100 halvings for a double,
 * usually about 45). Bisection is slower than Newton or Brent but cannot diverge, and each caller
 * here evaluates a cheap, monotone CDF.
 * Source: any numerical-analysis text (e.g. Numerical Recipes, 3rd ed., §9.1).
 *
 * Example: invertIncreasing((x) => x * x * x, 8, 0, 1) // => 2
 */
export function invertIncreasing(f: (x: number) => number, target: number, start: number, step: number): number {
  let lo = start - step;
  let hi = start + step;
  for (let width = step; f(lo) > target; width *= 2) lo -= width;
  for (let width = step; f(hi) < target; width *= 2) hi += width;
  for (;;) {
    const mid = 0.5 * (lo + hi);
    if (hi - lo <= 1e-12 * Math.max(1, Math.abs(mid)) || mid === lo || mid === hi) return mid;
    if (f(mid) < target) lo = mid;
    else hi = mid;
  }
}
