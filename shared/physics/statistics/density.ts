// The empirical density of an ensemble against the equilibrium density of a measure (Saff & Totik 1997,
// ch. IV; Forrester 2010, ch. 1): the normalised counts of the empirical measure (1/N) Σ_i δ_{x_i}
//   d = 1:     p̂_b = #{x_i ∈ [x_b, x_{b+1})} / (N w_b)   against (1/w_b) ∫_bin ρ dx;
//   d = 2, 3:  radial shells around the support's centre, p̂_b = #{|x_i − c| ∈ [r_b, r_{b+1})} / (N v_b)
//              against the shell average (1/v_b) ∫ ρ(r) |S^{d−1}| r^{d−1} dr (radial measures),
// pooled over configurations with bootstrap error bars (histogram.ts).
import type { Configuration } from '../types'
import type { EquilibriumMeasure } from '../equilibrium/types'
import { EngineInputError } from '../errors'
import { unitSphereArea } from '../kernels'
import { gaussLegendreOn, integrateTanhSinh } from '../quadrature'
import { bootstrap } from './bootstrap'
import { countBins, uniformEdges } from './histogram'
import { bootstrapOptions, checkBins, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'
import { ballVolume } from './window'

export interface DensityOptions extends ErrorBarOptions {
  readonly measure: EquilibriumMeasure
  readonly bins?: number
  /** Range of the histogram: [lo, hi] in d = 1, [0, hi] radially (default: the support, widened by 10 %). */
  readonly range?: readonly [number, number]
}

function supportExtent(measure: EquilibriumMeasure): { centre: number[], lo: number, hi: number } {
  const s = measure.support
  if (s.kind === 'ball' && measure.d === 1) return { centre: [...s.center], lo: s.center[0] - s.radius, hi: s.center[0] + s.radius }
  if (s.kind === 'ball') return { centre: [...s.center], lo: 0, hi: s.radius }
  if (s.kind === 'annulus') return { centre: [0, 0], lo: 0, hi: s.outer }
  if (s.kind === 'intervals') return { centre: [0], lo: Math.min(...s.intervals.map(i => i[0])), hi: Math.max(...s.intervals.map(i => i[1])) }
  throw new EngineInputError('density: the measure is uniform on a sphere or a torus; there is nothing to compare radially')
}

/** Empirical versus equilibrium density. */
export function empiricalDensity(configs: readonly Configuration[], options: DensityOptions): StatisticTable {
  const what = 'density'
  const d = checkConfigurations(configs, what, [1, 2, 3])
  const measure = options.measure
  if (measure.d !== d) throw new EngineInputError(`${what}: the measure has dimension ${measure.d}, the points ${d}`)
  const bins = options.bins ?? 40
  checkBins(bins, what)
  const ext = supportExtent(measure)
  let lo: number
  let hi: number
  if (options.range) [lo, hi] = options.range
  else if (d === 1) {
    const w = ext.hi - ext.lo
    lo = ext.lo - 0.1 * w
    hi = ext.hi + 0.1 * w
  }
  else {
    lo = 0
    hi = 1.1 * ext.hi
  }
  if (d > 1 && lo !== 0) throw new EngineInputError(`${what}: a radial histogram starts at r = 0 (got ${lo})`)
  const edges = uniformEdges(lo, hi, bins)
  const M = configs.length
  const counts: Float64Array[] = []
  const n: number[] = []
  for (const c of configs) {
    const v = new Float64Array(c.N)
    for (let i = 0; i < c.N; i++) {
      if (d === 1) v[i] = c.points[i]
      else {
        let s = 0
        for (let k = 0; k < d; k++) s += (c.points[i * d + k] - ext.centre[k]) ** 2
        v[i] = Math.sqrt(s)
      }
    }
    counts.push(countBins(v, edges))
    n.push(c.N)
  }
  const vol = new Float64Array(bins)
  for (let b = 0; b < bins; b++) vol[b] = d === 1 ? edges[b + 1] - edges[b] : ballVolume(d, edges[b + 1]) - ballVolume(d, edges[b])
  const out = new Float64Array(bins)
  const result = bootstrap(M, (w) => {
    out.fill(0)
    let t = 0
    for (let m = 0; m < M; m++) {
      t += w[m] * n[m]
      for (let b = 0; b < bins; b++) out[b] += w[m] * counts[m][b]
    }
    for (let b = 0; b < bins; b++) out[b] /= t * vol[b]
    return out
  }, bootstrapOptions(options))
  const x = new Float64Array(d)
  const rho = (r: number): number => {
    x.fill(0)
    for (let k = 0; k < d; k++) x[k] = ext.centre[k] ?? 0
    x[0] += r
    return measure.density(x, 0)
  }
  const area = unitSphereArea(d)
  const rows = []
  for (let b = 0; b < bins; b++) {
    const a = edges[b]
    const c = edges[b + 1]
    let eq: number
    if (d === 1) {
      eq = integrateTanhSinh((t) => {
        x[0] = t
        return measure.density(x, 0)
      }, a, c, { tol: 1e-11 }).value / (c - a)
    }
    else {
      // radial Gauss–Legendre; the support edge, where the density may jump, is a breakpoint
      const cuts = [a, c]
      const s = measure.support
      const radii = s.kind === 'ball' ? [s.radius] : s.kind === 'annulus' ? [s.inner, s.outer] : []
      for (const R of radii) if (R > a && R < c) cuts.splice(cuts.length - 1, 0, R)
      let total = 0
      for (let k = 0; k + 1 < cuts.length; k++) {
        const g = gaussLegendreOn(24, cuts[k], cuts[k + 1])
        for (let j = 0; j < 24; j++) total += g.weights[j] * rho(g.nodes[j]) * area * Math.pow(g.nodes[j], d - 1)
      }
      eq = total / vol[b]
    }
    rows.push({ x: (a + c) / 2, density: result.estimate[b], error: result.error[b], lower: result.lower[b], upper: result.upper[b], equilibrium: eq })
  }
  return makeTable({
    statistic: 'density',
    parameters: { bins, lo, hi, d },
    convention: d === 1 ? 'density of the empirical measure (1/N) Σ δ_{x_i} on the line' : `radial shells around (${ext.centre.join(', ')}), density per unit volume of (1/N) Σ δ_{x_i}`,
    columns: [
      { name: 'x', description: d === 1 ? 'bin centre' : 'shell centre radius' },
      { name: 'density', description: 'empirical density' },
      { name: 'error', description: 'bootstrap standard error over configurations' },
      { name: 'lower', description: 'lower end of the bootstrap interval' },
      { name: 'upper', description: 'upper end of the bootstrap interval' },
      { name: 'equilibrium', description: `bin average of the equilibrium density (${measure.source})` },
    ],
    rows,
    summary: {},
    errorBars: errorBarInfo(result, M),
    configurations: M,
    rejected: [],
    notes: [],
  })
}
