// Fluctuations of a linear statistic  L_N(f) = Σ_i f(x_i) − N ∫ f dμ_V  over an ensemble: its mean and
// variance across configurations with bootstrap error bars (Efron & Tibshirani 1993). For the 1-D log-gas
// with weight Π|x_i − x_j|^β e^{−(β/2) N Σ V(x_i)} (the canonical convention) and a one-interval support
// [c − R, c + R], Johansson's central limit theorem (Duke Math. J. 91, 1998, Theorem 2.4) gives
//   Var L_N(f) → (1/(2β)) Σ_{k≥1} k a_k²,   f(c + R t) = Σ_k a_k T_k(t)   (Chebyshev coefficients),
// the normalisation checked against the exact finite-N variances for f = x and f = x² of the Gaussian
// ensemble (Var Σ x_i = 1/(βa); Var Σ x_i² = (2/(β²Na²))(1 + β(N − 1)/2)), derived from Mehta's integral
// by translating and scaling. a_k = (2/n) Σ_j f(c + R cos θ_j) cos(kθ_j), θ_j = π(j + ½)/n (Gauss–Chebyshev,
// Abramowitz & Stegun 1964, 25.4.38; Trefethen, Approximation Theory and Approximation Practice, 2013, ch. 3).
// ∫ f dμ_V is computed by quadrature over the support: tanh–sinh on intervals (d = 1), Gauss–Legendre
// in polar (d = 2) or spherical (d = 3) coordinates on balls and annuli, a tensor rule on the torus box.
import type { Configuration } from '../types'
import type { EquilibriumMeasure } from '../equilibrium/types'
import { EngineInputError } from '../errors'
import { CompensatedSum } from '../summation'
import { gaussLegendreOn, integrateTanhSinh } from '../quadrature'
import { bootstrap } from './bootstrap'
import { bootstrapOptions, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'

export type TestFunction = (x: Float64Array) => number

/** Chebyshev coefficients a_0 … a_{K−1} of t ↦ g(t) on [−1, 1] (n-point Gauss–Chebyshev). */
export function chebyshevCoefficients(g: (t: number) => number, K: number, n = 256): Float64Array {
  const a = new Float64Array(K)
  const vals = new Float64Array(n)
  for (let j = 0; j < n; j++) vals[j] = g(Math.cos((Math.PI * (j + 0.5)) / n))
  for (let k = 0; k < K; k++) {
    let s = 0
    for (let j = 0; j < n; j++) s += vals[j] * Math.cos((k * Math.PI * (j + 0.5)) / n)
    a[k] = ((k === 0 ? 1 : 2) / n) * s
  }
  return a
}

/** Johansson's limiting variance (1/(2β)) Σ k a_k² for f on the interval [c − R, c + R]. */
export function johanssonVariance(f: (x: number) => number, beta: number, c: number, R: number, terms = 128): number {
  if (!(beta > 0)) throw new EngineInputError(`johanssonVariance: β must be > 0 (got ${beta})`)
  const a = chebyshevCoefficients(t => f(c + R * t), terms, Math.max(256, 2 * terms))
  let s = 0
  for (let k = 1; k < terms; k++) s += k * a[k] * a[k]
  return s / (2 * beta)
}

/** ∫ f dμ over the support of the measure. */
export function integrateAgainst(measure: EquilibriumMeasure, f: TestFunction, order = 96): number {
  const d = measure.d
  const s = measure.support
  const x = new Float64Array(d)
  const weightOf = (): number => measure.density(x, 0)
  if (d === 1) {
    const intervals = s.kind === 'ball' ? [[s.center[0] - s.radius, s.center[0] + s.radius]] : s.kind === 'intervals' ? s.intervals : undefined
    if (!intervals) throw new EngineInputError(`linear statistic: the measure's support kind '${s.kind}' is not an interval`)
    let total = 0
    for (const [a, b] of intervals) {
      total += integrateTanhSinh((t) => {
        x[0] = t
        return f(x) * weightOf()
      }, a, b, { tol: 1e-12 }).value
    }
    return total
  }
  if (s.kind === 'whole') throw new EngineInputError('linear statistic: for the uniform measure on a torus or a sphere give the mean ∫ f dμ explicitly')
  let inner = 0
  let outer: number
  let centre: readonly number[]
  if (s.kind === 'ball') {
    outer = s.radius
    centre = s.center
  }
  else if (s.kind === 'annulus') {
    inner = s.inner
    outer = s.outer
    centre = [0, 0]
  }
  else {
    throw new EngineInputError(`linear statistic: support kind '${s.kind}' in d = ${d} is not supported`)
  }
  const radial = gaussLegendreOn(order, inner, outer)
  const acc = new CompensatedSum()
  if (d === 2) {
    const A = 2 * order
    for (let i = 0; i < order; i++) {
      const r = radial.nodes[i]
      for (let j = 0; j < A; j++) {
        const t = (2 * Math.PI * j) / A
        x[0] = centre[0] + r * Math.cos(t)
        x[1] = centre[1] + r * Math.sin(t)
        acc.add(radial.weights[i] * r * ((2 * Math.PI) / A) * f(x) * weightOf())
      }
    }
    return acc.value
  }
  const polar = gaussLegendreOn(order, -1, 1)
  const A = 2 * order
  for (let i = 0; i < order; i++) {
    const r = radial.nodes[i]
    for (let p = 0; p < order; p++) {
      const z = polar.nodes[p]
      const rho = Math.sqrt(1 - z * z)
      for (let j = 0; j < A; j++) {
        const t = (2 * Math.PI * j) / A
        x[0] = centre[0] + r * rho * Math.cos(t)
        x[1] = centre[1] + r * rho * Math.sin(t)
        x[2] = centre[2] + r * z
        acc.add(radial.weights[i] * r * r * polar.weights[p] * ((2 * Math.PI) / A) * f(x) * weightOf())
      }
    }
  }
  return acc.value
}

export interface LinearStatisticOptions extends ErrorBarOptions {
  readonly f: TestFunction
  /** A name for f (shown in the table), e.g. 'x^2'. */
  readonly label: string
  /** The measure μ_V; or give `mean` = ∫ f dμ directly. */
  readonly measure?: EquilibriumMeasure
  readonly mean?: number
  /** For 1-D samples on one interval: add Johansson's limiting variance at this β. */
  readonly beta?: number
}

/** Per-configuration L_N(f), with the ensemble mean and variance and their bootstrap error bars. */
export function linearStatistic(configs: readonly Configuration[], options: LinearStatisticOptions): StatisticTable {
  const what = 'linear statistic'
  const d = checkConfigurations(configs, what, [1, 2, 3])
  if (options.measure === undefined && options.mean === undefined) throw new EngineInputError(`${what}: give the equilibrium measure or the mean ∫ f dμ`)
  if (options.measure !== undefined && options.measure.d !== d) throw new EngineInputError(`${what}: the measure has dimension ${options.measure.d}, the points ${d}`)
  const integral = options.mean ?? integrateAgainst(options.measure as EquilibriumMeasure, options.f)
  const M = configs.length
  const values = new Float64Array(M)
  configs.forEach((c, m) => {
    const acc = new CompensatedSum()
    const x = new Float64Array(d)
    for (let i = 0; i < c.N; i++) {
      for (let k = 0; k < d; k++) x[k] = c.points[i * d + k]
      const v = options.f(x)
      if (!Number.isFinite(v)) throw new EngineInputError(`${what}: f is not finite at point ${i} of configuration ${m}`, { configuration: m, index: i })
      acc.add(v)
    }
    acc.add(-c.N * integral)
    values[m] = acc.value
  })
  const result = bootstrap(M, (w) => {
    let t = 0
    let s = 0
    for (let m = 0; m < M; m++) {
      t += w[m]
      s += w[m] * values[m]
    }
    const mean = s / t
    let v = 0
    for (let m = 0; m < M; m++) v += w[m] * (values[m] - mean) ** 2
    return [mean, t > 1 ? v / (t - 1) : Number.NaN]
  }, bootstrapOptions(options))
  const summary: Record<string, number> = {
    integral,
    mean: result.estimate[0],
    meanError: result.error[0],
    variance: result.estimate[1],
    varianceError: result.error[1],
  }
  const notes: string[] = []
  if (options.beta !== undefined) {
    const s = options.measure?.support
    if (d === 1 && s?.kind === 'ball') {
      const f = options.f
      const x = new Float64Array(1)
      summary.limitingVariance = johanssonVariance((t) => {
        x[0] = t
        return f(x)
      }, options.beta, s.center[0], s.radius)
      notes.push('limitingVariance: Johansson (1998), (1/(2β)) Σ k a_k² with Chebyshev coefficients a_k of f on the support')
    }
    else {
      notes.push('no limiting variance: it is given here for 1-D samples with a one-interval support')
    }
  }
  return makeTable({
    statistic: 'linear',
    parameters: { f: options.label, ...(options.beta !== undefined ? { beta: options.beta } : {}) },
    convention: 'L_N(f) = Σ_i f(x_i) − N ∫ f dμ_V per configuration',
    columns: [
      { name: 'configuration', description: 'index of the configuration (0-based)' },
      { name: 'N', description: 'number of points' },
      { name: 'value', description: 'L_N(f)' },
    ],
    rows: configs.map((c, m) => ({ configuration: m, N: c.N, value: values[m] })),
    summary,
    errorBars: errorBarInfo(result, M),
    configurations: M,
    rejected: [],
    notes,
  })
}
