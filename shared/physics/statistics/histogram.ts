// Histograms over an ensemble: per-configuration bin counts c_{m,b} pooled into the density estimate
//   p̂_b = Σ_m c_{m,b} / (w_b Σ_m n_m)   (n_m values in configuration m, bin width w_b),
// a ratio estimator whose error bar comes from resampling whole configurations (Efron & Tibshirani
// 1993, ch. 6). Values outside [edges[0], edges[B]) are counted as "outside" and still enter n_m, so the
// histogram integrates to the fraction inside the range. Common practice.
import { EngineInputError } from '../errors'
import { bootstrap, type BootstrapOptions, type BootstrapResult } from './bootstrap'

/** B + 1 equally spaced edges from lo to hi. */
export function uniformEdges(lo: number, hi: number, bins: number): Float64Array {
  if (!(hi > lo)) throw new EngineInputError(`histogram: the range [${lo}, ${hi}] is empty`)
  const e = new Float64Array(bins + 1)
  for (let b = 0; b <= bins; b++) e[b] = lo + ((hi - lo) * b) / bins
  e[bins] = hi
  return e
}

/** Bin index of x for equally spaced edges, −1 outside. */
export function binOf(x: number, edges: Float64Array): number {
  const B = edges.length - 1
  const lo = edges[0]
  const hi = edges[B]
  if (!(x >= lo && x < hi)) return -1
  return Math.min(B - 1, Math.floor(((x - lo) / (hi - lo)) * B))
}

/** Counts of each configuration's values in the bins. */
export function countBins(values: ArrayLike<number>, edges: Float64Array): Float64Array {
  const counts = new Float64Array(edges.length - 1)
  for (let i = 0; i < values.length; i++) {
    const b = binOf(values[i], edges)
    if (b >= 0) counts[b]++
  }
  return counts
}

export interface PooledHistogram {
  readonly edges: Float64Array
  readonly density: BootstrapResult
  /** Σ_m c_{m,b}: the raw pooled counts. */
  readonly counts: Float64Array
  /** Σ_m n_m. */
  readonly total: number
}

/** Pools per-configuration values into a normalised histogram with bootstrap error bars. */
export function pooledHistogram(valuesPerConfig: ArrayLike<number>[], edges: Float64Array, options: BootstrapOptions): PooledHistogram {
  const M = valuesPerConfig.length
  const B = edges.length - 1
  const counts = valuesPerConfig.map(v => countBins(v, edges))
  const n = valuesPerConfig.map(v => v.length)
  const pooled = new Float64Array(B)
  let total = 0
  for (let m = 0; m < M; m++) {
    total += n[m]
    for (let b = 0; b < B; b++) pooled[b] += counts[m][b]
  }
  if (total === 0) throw new EngineInputError('histogram: there are no values to count')
  const out = new Float64Array(B)
  const density = bootstrap(M, (w) => {
    out.fill(0)
    let t = 0
    for (let m = 0; m < M; m++) {
      if (w[m] === 0) continue
      t += w[m] * n[m]
      for (let b = 0; b < B; b++) out[b] += w[m] * counts[m][b]
    }
    for (let b = 0; b < B; b++) out[b] = t > 0 ? out[b] / (t * (edges[b + 1] - edges[b])) : Number.NaN
    return out
  }, options)
  return { edges, density, counts: pooled, total }
}
