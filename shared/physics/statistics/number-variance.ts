// Number variance in balls: for balls B(c, r) with centres c drawn uniformly where the whole ball lies in
// the window (the bulk ball shrunk by r, or anywhere on the periodic box), n(c, r) = #{i : |x_i − c| ≤ r},
//   Σ²(r) = E[n²] − E[n]²  over configurations and centres
// (Illian, Penttinen, Stoyan & Stoyan 2008, §4.2; Torquato & Stillinger, Phys. Rev. E 68, 2003, for the
// surface-law growth of hyperuniform systems). References: Poisson process, Σ² = E[n] (Illian et al.
// 2008, §2.4); the infinite Ginibre process of density 1/π (the 2-D plasma at β = 2),
//   Σ²(R) = R² e^{−2R²} [I₀(2R²) + I₁(2R²)]
// (Shirai, J. Stat. Phys. 123, 2006 — reference recalled from memory), for density ρ with R
// replaced by R√(πρ);
// e^{−x} I_n(x) = (1/π) ∫_0^π e^{x(cos θ − 1)} cos(nθ) dθ (Abramowitz & Stegun 1964, 9.6.19) by the
// trapezoidal rule, exponentially accurate for this periodic integrand.
import type { Configuration } from '../types'
import { EngineInputError } from '../errors'
import { bootstrap } from './bootstrap'
import { buildCellList, countWithin } from './cell-list'
import { bootstrapOptions, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'
import { ballVolume, checkWindow, describeWindow, windowVolume, type Window } from './window'

/** e^{−x} I_n(x) for x ≥ 0, n = 0, 1 (modified Bessel functions, exponentially scaled). */
export function scaledBesselI(n: 0 | 1, x: number): number {
  if (!(x >= 0)) throw new EngineInputError(`scaledBesselI: x must be ≥ 0 (got ${x})`)
  const K = 64 + Math.ceil(8 * Math.sqrt(x))
  let s = 0
  for (let j = 0; j <= K; j++) {
    const t = (Math.PI * j) / K
    const w = j === 0 || j === K ? 0.5 : 1
    s += w * Math.exp(x * (Math.cos(t) - 1)) * Math.cos(n * t)
  }
  return s / K
}

/** Σ²(R) of the infinite Ginibre process with density ρ. */
export function ginibreNumberVariance(R: number, rho = 1 / Math.PI): number {
  const Rs2 = Math.PI * rho * R * R
  return Rs2 * (scaledBesselI(0, 2 * Rs2) + scaledBesselI(1, 2 * Rs2))
}

/** A uniform point in the ball of radius r centred at c (rejection from the cube), or in [0, L)^d. */
function randomCentre(d: number, uniform: () => number, win: Window, r: number): number[] {
  if (win.kind === 'torus') return Array.from({ length: d }, () => uniform() * win.L)
  const R = win.radius - r
  for (;;) {
    const y = Array.from({ length: d }, () => 2 * uniform() - 1)
    if (y.reduce((s, v) => s + v * v, 0) <= 1) return y.map((v, k) => win.center[k] + R * v)
  }
}

export interface NumberVarianceOptions extends ErrorBarOptions {
  readonly window: Window
  readonly radii: readonly number[]
  /** Centres per configuration and radius (default 200). */
  readonly centres?: number
  /** Random numbers for the centres (default: the same `uniform` as the bootstrap). */
  readonly centreUniform?: () => number
  readonly reference?: 'poisson' | 'ginibre'
}

/** Σ²(r) and the mean count at the given radii, with bootstrap error bars over configurations. */
export function numberVariance(configs: readonly Configuration[], options: NumberVarianceOptions): StatisticTable {
  const what = 'number variance'
  const d = checkConfigurations(configs, what, [1, 2, 3])
  const win = options.window
  checkWindow(win, d, what)
  const radii = options.radii
  if (radii.length === 0) throw new EngineInputError(`${what}: give at least one radius`)
  radii.forEach((r, j) => {
    if (!(r > 0) || !Number.isFinite(r)) throw new EngineInputError(`${what}: radius number ${j + 1} must be a finite number > 0 (got ${r})`)
    if (win.kind === 'ball' && r >= win.radius) throw new EngineInputError(`${what}: radius ${r} does not fit in the window of radius ${win.radius}`)
    if (win.kind === 'torus' && r > win.L / 2) throw new EngineInputError(`${what}: radius ${r} exceeds half the box side ${win.L / 2}`)
  })
  const K = options.centres ?? 200
  if (!Number.isInteger(K) || K < 1) throw new EngineInputError(`${what}: the number of centres must be an integer ≥ 1 (got ${K})`)
  const rng = options.centreUniform ?? options.uniform
  const J = radii.length
  const M = configs.length
  const s1 = configs.map(() => new Float64Array(J))
  const s2 = configs.map(() => new Float64Array(J))
  configs.forEach((c, m) => {
    const list = buildCellList(c.points, d, win.kind === 'torus' ? win.L : undefined)
    radii.forEach((r, j) => {
      for (let q = 0; q < K; q++) {
        const n = countWithin(list, randomCentre(d, rng, win, r), r)
        s1[m][j] += n
        s2[m][j] += n * n
      }
    })
  })
  const out = new Float64Array(2 * J)
  const result = bootstrap(M, (w) => {
    out.fill(0)
    let t = 0
    for (let m = 0; m < M; m++) {
      t += w[m] * K
      for (let j = 0; j < J; j++) {
        out[j] += w[m] * s1[m][j]
        out[J + j] += w[m] * s2[m][j]
      }
    }
    for (let j = 0; j < J; j++) {
      const mean = out[j] / t
      out[J + j] = out[J + j] / t - mean * mean
      out[j] = mean
    }
    return out
  }, bootstrapOptions(options))
  let total = 0
  for (const c of configs) total += c.N
  const rho = win.kind === 'torus' ? total / M / windowVolume(win, d) : Number.NaN
  const rows = radii.map((r, j) => {
    const row: Record<string, number> = {
      r,
      mean: result.estimate[j],
      meanError: result.error[j],
      variance: result.estimate[J + j],
      error: result.error[J + j],
      lower: result.lower[J + j],
      upper: result.upper[J + j],
    }
    if (options.reference === 'poisson') row.reference = result.estimate[j]
    if (options.reference === 'ginibre') {
      if (d !== 2) throw new EngineInputError(`${what}: the Ginibre reference is for points in the plane (d = ${d})`)
      row.reference = ginibreNumberVariance(r, result.estimate[j] / ballVolume(2, r))
    }
    return row
  })
  return makeTable({
    statistic: 'number-variance',
    parameters: { centres: K, d },
    convention: `balls with uniformly random centres, each ball inside the ${describeWindow(win, d)}`,
    columns: [
      { name: 'r', description: 'ball radius' },
      { name: 'mean', description: 'mean number of points in the ball' },
      { name: 'meanError', description: 'bootstrap standard error of the mean' },
      { name: 'variance', description: 'number variance Σ²(r)' },
      { name: 'error', description: 'bootstrap standard error of Σ² over configurations' },
      { name: 'lower', description: 'lower end of the bootstrap interval' },
      { name: 'upper', description: 'upper end of the bootstrap interval' },
      ...(options.reference ? [{ name: 'reference', description: options.reference === 'poisson' ? 'Poisson process: Σ² = mean' : 'infinite Ginibre process at the observed density' }] : []),
    ],
    rows,
    summary: win.kind === 'torus' ? { intensity: rho } : {},
    errorBars: errorBarInfo(result, M),
    configurations: M,
    rejected: [],
    notes: [],
  })
}
