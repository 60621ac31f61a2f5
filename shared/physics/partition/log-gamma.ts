// log Γ(x) and the digamma function ψ(x) = Γ'(x)/Γ(x) for x > 0, by the recurrences
//   log Γ(x) = log Γ(x + n) − log(x (x + 1) ⋯ (x + n − 1)),   ψ(x) = ψ(x + n) − Σ_{k<n} 1/(x + k),
// up to x + n ≥ 16, and Stirling's asymptotic series with Bernoulli numbers B_{2k}
//   log Γ(z) = (z − ½) log z − z + ½ log 2π + Σ_{k=1}^{K} B_{2k} / (2k(2k − 1) z^{2k−1}),
//   ψ(z) = log z − 1/(2z) − Σ_{k=1}^{K} B_{2k} / (2k z^{2k})
// (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, 6.1.40, 6.3.18 and 6.1.15, 6.3.5;
// NIST DLMF 5.11.1, 5.11.2). With z ≥ 16 and K = 10 the truncation error is below 1e−25, so the error is
// rounding: about 1e−15 absolute for x ≤ 100 and 1e−16 relative to x log x beyond.
import { EngineInputError } from '../errors'

// B_2, B_4, …, B_20
const BERNOULLI = [1 / 6, -1 / 30, 1 / 42, -1 / 30, 5 / 66, -691 / 2730, 7 / 6, -3617 / 510, 43867 / 798, -174611 / 330]
const SHIFT = 16

function check(x: number, what: string): void {
  if (!(x > 0) || !Number.isFinite(x)) throw new EngineInputError(`${what}: x must be a finite number > 0 (got ${x})`)
}

/** log Γ(x) for x > 0. */
export function logGamma(x: number): number {
  check(x, 'logGamma')
  let z = x
  let shift = 0
  let product = 1
  while (z < SHIFT) {
    product *= z
    z += 1
    if (product > 1e280) {
      shift += Math.log(product)
      product = 1
    }
  }
  shift += Math.log(product)
  const z2 = z * z
  let series = 0
  let power = z
  for (let k = 1; k <= BERNOULLI.length; k++) {
    series += BERNOULLI[k - 1] / (2 * k * (2 * k - 1) * power)
    power *= z2
  }
  return (z - 0.5) * Math.log(z) - z + 0.5 * Math.log(2 * Math.PI) + series - shift
}

/** ψ(x) = d/dx log Γ(x) for x > 0. */
export function digamma(x: number): number {
  check(x, 'digamma')
  let z = x
  let shift = 0
  while (z < SHIFT) {
    shift += 1 / z
    z += 1
  }
  const z2 = z * z
  let series = 0
  let power = z2
  for (let k = 1; k <= BERNOULLI.length; k++) {
    series += BERNOULLI[k - 1] / (2 * k * power)
    power *= z2
  }
  return Math.log(z) - 1 / (2 * z) - series - shift
}

/** log n! = log Γ(n + 1) for integers n ≥ 0, summed exactly from log k for n ≤ 20. */
export function logFactorial(n: number): number {
  if (!Number.isInteger(n) || n < 0) throw new EngineInputError(`logFactorial: n must be an integer ≥ 0 (got ${n})`)
  if (n <= 20) {
    let p = 1
    for (let k = 2; k <= n; k++) p *= k
    return Math.log(p)
  }
  return logGamma(n + 1)
}
