// Nearest-neighbour spacings of 1-D configurations, unfolded through the equilibrium distribution
// function F(x) = μ_V((−∞, x]):  s_i = N (F(x_(i+1)) − F(x_(i)))  for consecutive ordered points, kept
// when both lie in the bulk F ∈ [(1 − φ)/2, (1 + φ)/2] (Mehta, Random Matrices, 3rd ed. 2004, §1.4 and
// §6.1; Forrester, Log-gases and Random Matrices, 2010, §7.1). For the semicircle of radius R,
//   F(x) = ½ + (u√(1 − u²) + arcsin u)/π,   u = x/R   (integral of (2/(πR²))√(R² − x²));
// for other measures F is the integral of the density by tanh–sinh quadrature.
// Reference curves, the Wigner surmise with mean 1 (exact for 2×2 matrices; Mehta 2004, §1.5):
//   p₁(s) = (π/2) s e^{−πs²/4},   p₂(s) = (32/π²) s² e^{−4s²/π},
//   p₄(s) = (2¹⁸/(3⁶π³)) s⁴ e^{−64s²/(9π)}.
import type { Configuration } from '../types'
import type { EquilibriumMeasure } from '../equilibrium/types'
import { EngineInputError } from '../errors'
import { integrateTanhSinh } from '../quadrature'
import { uniformEdges, pooledHistogram } from './histogram'
import { bootstrap } from './bootstrap'
import { bootstrapOptions, checkBins, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'

/** The Wigner surmise p_β(s) for β = 1, 2, 4, normalised to total mass 1 and mean 1. */
export function wignerSurmise(beta: 1 | 2 | 4, s: number): number {
  if (s < 0) return 0
  if (beta === 1) return (Math.PI / 2) * s * Math.exp((-Math.PI * s * s) / 4)
  if (beta === 2) return (32 / (Math.PI * Math.PI)) * s * s * Math.exp((-4 * s * s) / Math.PI)
  if (beta === 4) return (Math.pow(2, 18) / (Math.pow(3, 6) * Math.pow(Math.PI, 3))) * Math.pow(s, 4) * Math.exp((-64 * s * s) / (9 * Math.PI))
  throw new EngineInputError(`the Wigner surmise is defined here for β = 1, 2, 4 (got ${String(beta)})`)
}

/** Distribution function of the measure on the line, F(x) = μ((−∞, x]). */
export function equilibriumCdf(measure: EquilibriumMeasure): (x: number) => number {
  if (measure.d !== 1) throw new EngineInputError(`spacings need a measure on the line (the measure has dimension ${measure.d})`)
  const s = measure.support
  let intervals: Array<[number, number]>
  if (s.kind === 'ball') intervals = [[s.center[0] - s.radius, s.center[0] + s.radius]]
  else if (s.kind === 'intervals') intervals = s.intervals.map(i => [i[0], i[1]] as [number, number]).sort((p, q) => p[0] - q[0])
  else throw new EngineInputError(`spacings need a measure supported on intervals of the line (support kind '${s.kind}')`)
  const density = (x: number): number => measure.density([x], 0)
  if (s.kind === 'ball' && measure.method === 'closed-form' && measure.kernel.name === 'log') {
    const R = s.radius
    const c = s.center[0]
    const semicircle = (x: number): number => (2 / (Math.PI * R * R)) * Math.sqrt(Math.max(0, R * R - (x - c) ** 2))
    const probes = [c, c + 0.3 * R, c - 0.71 * R]
    if (probes.every(x => Math.abs(density(x) - semicircle(x)) <= 1e-12 * semicircle(c))) {
      return (x: number) => {
        const u = Math.max(-1, Math.min(1, (x - c) / R))
        return 0.5 + (u * Math.sqrt(1 - u * u) + Math.asin(u)) / Math.PI
      }
    }
  }
  const masses = intervals.map(([a, b]) => integrateTanhSinh(density, a, b, { tol: 1e-13 }).value)
  return (x: number) => {
    let F = 0
    for (let k = 0; k < intervals.length; k++) {
      const [a, b] = intervals[k]
      if (x >= b) F += masses[k]
      else if (x > a) F += integrateTanhSinh(density, a, x, { tol: 1e-12 }).value
    }
    return Math.min(1, Math.max(0, F))
  }
}

export interface SpacingOptions extends ErrorBarOptions {
  readonly measure: EquilibriumMeasure
  /** Fraction φ of the mass kept around the median, 0 < φ ≤ 1 (default 0.5). */
  readonly bulkFraction?: number
  readonly bins?: number
  /** Upper end of the histogram in units of the mean spacing (default 4). */
  readonly smax?: number
  /** 'none': s = N ΔF as it is (mean ≈ 1); 'mean': also divide by the sample mean of s. */
  readonly normalise?: 'none' | 'mean'
  /** When given, the Wigner surmise p_β is added to each row (β = 1, 2, 4). */
  readonly beta?: number
}

/** Unfolded bulk spacings of one configuration. */
export function unfoldedSpacings(config: Configuration, F: (x: number) => number, bulkFraction: number): Float64Array {
  const N = config.N
  const x = Float64Array.from(config.points).sort()
  const u = x.map(F)
  const lo = (1 - bulkFraction) / 2
  const hi = (1 + bulkFraction) / 2
  const out: number[] = []
  for (let i = 0; i + 1 < N; i++) {
    if (u[i] >= lo && u[i + 1] <= hi) out.push(N * (u[i + 1] - u[i]))
  }
  return Float64Array.from(out)
}

/** Histogram of unfolded bulk spacings with bootstrap error bars, and the Wigner surmise for reference. */
export function spacingDistribution(configs: readonly Configuration[], options: SpacingOptions): StatisticTable {
  const what = 'spacings'
  checkConfigurations(configs, what, [1])
  const bins = options.bins ?? 40
  checkBins(bins, what)
  const phi = options.bulkFraction ?? 0.5
  if (!(phi > 0 && phi <= 1)) throw new EngineInputError(`${what}: the bulk fraction must lie in (0, 1] (got ${phi})`)
  const smax = options.smax ?? 4
  const F = equilibriumCdf(options.measure)
  const rejected: Array<{ configuration: number, reason: string }> = []
  const kept: Float64Array[] = []
  configs.forEach((c, m) => {
    const s = unfoldedSpacings(c, F, phi)
    if (s.length === 0) rejected.push({ configuration: m, reason: 'no pair of consecutive points lies in the bulk' })
    else kept.push(s)
  })
  if (kept.length === 0) throw new EngineInputError(`${what}: no configuration has a spacing in the bulk (fraction ${phi})`)
  let sum = 0
  let count = 0
  for (const s of kept) {
    for (const v of s) sum += v
    count += s.length
  }
  const mean = sum / count
  const normalise = options.normalise ?? 'none'
  const values = normalise === 'mean' ? kept.map(s => s.map(v => v / mean)) : kept
  const edges = uniformEdges(0, smax, bins)
  const bo = bootstrapOptions(options)
  const hist = pooledHistogram(values, edges, bo)
  const sums = kept.map(s => s.reduce((a, b) => a + b, 0))
  const ns = kept.map(s => s.length)
  const meanBoot = bootstrap(kept.length, (w) => {
    let a = 0
    let b = 0
    for (let m = 0; m < w.length; m++) {
      a += w[m] * sums[m]
      b += w[m] * ns[m]
    }
    return [a / b]
  }, bo)
  const beta = options.beta
  const surmise = beta === 1 || beta === 2 || beta === 4 ? beta : undefined
  const rows = []
  for (let b = 0; b < bins; b++) {
    const centre = (edges[b] + edges[b + 1]) / 2
    const row: Record<string, number> = {
      s: centre,
      sLow: edges[b],
      sHigh: edges[b + 1],
      density: hist.density.estimate[b],
      error: hist.density.error[b],
      lower: hist.density.lower[b],
      upper: hist.density.upper[b],
      count: hist.counts[b],
    }
    if (surmise !== undefined) row.surmise = wignerSurmise(surmise, centre)
    rows.push(row)
  }
  const notes = [`spacings s = N (F(x_(i+1)) − F(x_(i))) with F the distribution function of the equilibrium measure (${options.measure.source})`]
  if (beta !== undefined && surmise === undefined) notes.push(`no Wigner surmise for β = ${beta} (defined for β = 1, 2, 4)`)
  return makeTable({
    statistic: 'spacing',
    parameters: { bulkFraction: phi, bins, smax, normalise, ...(beta !== undefined ? { beta } : {}) },
    convention: normalise === 'mean' ? 'unfolded spacings divided by their sample mean' : 'unfolded spacings in units of the mean equilibrium spacing',
    columns: [
      { name: 's', description: 'bin centre (unfolded spacing)' },
      { name: 'sLow', description: 'lower edge of the bin' },
      { name: 'sHigh', description: 'upper edge of the bin' },
      { name: 'density', description: 'histogram density of the spacings' },
      { name: 'error', description: 'bootstrap standard error over configurations' },
      { name: 'lower', description: 'lower end of the bootstrap interval' },
      { name: 'upper', description: 'upper end of the bootstrap interval' },
      { name: 'count', description: 'pooled number of spacings in the bin' },
      ...(surmise !== undefined ? [{ name: 'surmise', description: `Wigner surmise p_${surmise}(s)` }] : []),
    ],
    rows,
    summary: { meanSpacing: mean, meanSpacingError: meanBoot.error[0], spacings: count, fractionInRange: hist.counts.reduce((a, b) => a + b, 0) / count },
    errorBars: errorBarInfo(hist.density, kept.length),
    configurations: kept.length,
    rejected,
    notes,
  })
}
