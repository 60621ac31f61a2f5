// The nonparametric bootstrap over configurations (Efron & Tibshirani, An Introduction to the Bootstrap,
// 1993): resample the M configurations with replacement B times, recompute the statistic on each
// resample, and report
//   the standard error  se = sqrt( Σ_b (θ*_b − θ̄*)² / (B − 1) )            (ch. 6, eq. 6.6),
//   the interval θ̂ ± z_{(1+level)/2} se  ('standard-error', ch. 12–13), or
//   the percentile interval [θ*_{((1−level)/2)}, θ*_{((1+level)/2)}]        ('percentile', ch. 13).
// A resample is passed to the statistic as multiplicities w_m (how often configuration m was drawn),
// so statistics built from per-configuration sums (ratio estimators such as normalised histograms)
// are resampled as wholes. The normal quantile is found by Newton's method on Φ, with erf from its
// Taylor series for |x| < 3 and erfc from its continued fraction beyond (Abramowitz & Stegun, Handbook
// of Mathematical Functions, 1964, 7.1.5 and 7.1.14).
import { EngineInputError } from '../errors'

export interface BootstrapOptions {
  /** Random numbers in [0, 1) (seeded by the caller). */
  readonly uniform: () => number
  /** Number of resamples B (default 200). */
  readonly replicates?: number
  readonly method?: 'percentile' | 'standard-error'
  /** Coverage of the interval (default 0.6827, one standard error). */
  readonly level?: number
}

export interface BootstrapResult {
  /** The statistic on the original sample (all multiplicities 1). */
  readonly estimate: Float64Array
  /** Bootstrap standard error per component (NaN with a single configuration). */
  readonly error: Float64Array
  readonly lower: Float64Array
  readonly upper: Float64Array
  readonly replicates: number
  readonly method: 'percentile' | 'standard-error'
  readonly level: number
}

function erfSeries(x: number): number {
  // erf x = (2/√π) Σ (−1)^n x^{2n+1} / (n! (2n+1))
  let term = x
  let sum = x
  const x2 = x * x
  for (let n = 1; n < 200; n++) {
    term *= -x2 / n
    const add = term / (2 * n + 1)
    sum += add
    if (Math.abs(add) < 1e-17 * Math.abs(sum)) break
  }
  return (2 / Math.sqrt(Math.PI)) * sum
}

function erfcContinuedFraction(x: number): number {
  // erfc x = (e^{−x²}/√π) · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + …)))), x > 0, evaluated from the tail
  let f = x
  for (let k = 60; k >= 1; k--) f = x + (k / 2) / f
  return Math.exp(-x * x) / (Math.sqrt(Math.PI) * f)
}

/** The standard normal distribution function Φ(x). */
export function normalCdf(x: number): number {
  const t = x / Math.SQRT2
  if (Math.abs(t) < 3) return 0.5 * (1 + erfSeries(t))
  return t > 0 ? 1 - 0.5 * erfcContinuedFraction(t) : 0.5 * erfcContinuedFraction(-t)
}

/** The standard normal quantile Φ⁻¹(p), 0 < p < 1. */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new EngineInputError(`normalQuantile: p must lie in (0, 1) (got ${p})`)
  let x = 0
  for (let it = 0; it < 100; it++) {
    const dens = Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI)
    const step = (normalCdf(x) - p) / dens
    x -= Math.max(-1, Math.min(1, step))
    if (Math.abs(step) < 1e-14 * Math.max(1, Math.abs(x))) break
  }
  return x
}

/** The q-quantile of sorted values (linear interpolation between order statistics). */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length
  if (n === 0) return Number.NaN
  const h = (n - 1) * q
  const lo = Math.floor(h)
  const hi = Math.min(n - 1, lo + 1)
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo])
}

/**
 * Bootstraps a vector statistic of M configurations. `statistic(w)` receives multiplicities w_m ≥ 0
 * (Σ w_m = M) and returns the statistic's components; it must not keep w.
 */
export function bootstrap(M: number, statistic: (w: Float64Array) => ArrayLike<number>, options: BootstrapOptions): BootstrapResult {
  if (!Number.isInteger(M) || M < 1) throw new EngineInputError(`bootstrap: the number of configurations must be an integer ≥ 1 (got ${M})`)
  const B = options.replicates ?? 200
  if (!Number.isInteger(B) || B < 2) throw new EngineInputError(`bootstrap: the number of replicates must be an integer ≥ 2 (got ${B})`)
  const method = options.method ?? 'standard-error'
  const level = options.level ?? 0.6826894921370859
  if (!(level > 0 && level < 1)) throw new EngineInputError(`bootstrap: the level must lie in (0, 1) (got ${level})`)
  const w = new Float64Array(M).fill(1)
  const estimate = Float64Array.from(statistic(w))
  const K = estimate.length
  const error = new Float64Array(K).fill(Number.NaN)
  const lower = new Float64Array(K).fill(Number.NaN)
  const upper = new Float64Array(K).fill(Number.NaN)
  if (M === 1) return { estimate, error, lower, upper, replicates: 0, method, level }
  const reps: Float64Array[] = []
  for (let b = 0; b < B; b++) {
    w.fill(0)
    for (let m = 0; m < M; m++) {
      const u = options.uniform()
      if (!(u >= 0 && u < 1)) throw new EngineInputError(`bootstrap: uniform() must return numbers in [0, 1) (got ${u})`)
      w[Math.floor(u * M)] += 1
    }
    const value = statistic(w)
    if (value.length !== K) throw new EngineInputError(`bootstrap: the statistic returned ${value.length} components on a resample, ${K} on the sample`)
    reps.push(Float64Array.from(value))
  }
  const z = normalQuantile((1 + level) / 2)
  const column = new Float64Array(B)
  for (let k = 0; k < K; k++) {
    let mean = 0
    let finite = 0
    for (let b = 0; b < B; b++) {
      column[b] = reps[b][k]
      if (Number.isFinite(column[b])) {
        mean += column[b]
        finite++
      }
    }
    if (finite < 2) continue
    mean /= finite
    let ss = 0
    for (let b = 0; b < B; b++) if (Number.isFinite(column[b])) ss += (column[b] - mean) ** 2
    error[k] = Math.sqrt(ss / (finite - 1))
    if (method === 'standard-error') {
      lower[k] = estimate[k] - z * error[k]
      upper[k] = estimate[k] + z * error[k]
    }
    else {
      const sorted = column.filter(Number.isFinite).sort()
      lower[k] = quantileSorted(sorted, (1 - level) / 2)
      upper[k] = quantileSorted(sorted, (1 + level) / 2)
    }
  }
  return { estimate, error, lower, upper, replicates: B, method, level }
}

/** The weighted mean Σ w_m x_m / Σ w_m of per-configuration values (a helper for statistics). */
export function weightedMean(values: ArrayLike<number>, w: ArrayLike<number>): number {
  let s = 0
  let n = 0
  for (let m = 0; m < values.length; m++) {
    s += w[m] * values[m]
    n += w[m]
  }
  return s / n
}
