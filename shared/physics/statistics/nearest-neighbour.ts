// Nearest-neighbour distances r_i = min_{j≠i} |x_i − x_j| in d = 1, 2, 3, in free space or on the periodic
// box with minimum-image distances, found with a cell list searched ring by ring: after the cells at
// Chebyshev offset ≤ k have been searched, every other point is at least k·h away (h the cell side), so
// the search stops once the best distance is ≤ k·h. Reference for a Poisson process of intensity ρ:
//   P(r_i > r) = exp(−ρ |B_r|),  density ρ |S^{d−1}| r^{d−1} exp(−ρ |B_r|)
// (Illian, Penttinen, Stoyan & Stoyan, Statistical Analysis and Modelling of Spatial Point Patterns,
// 2008, §2.3 and §4.2.6).
import type { Configuration } from '../types'
import { EngineInputError } from '../errors'
import { unitSphereArea } from '../kernels'
import { buildCellList, distance2, visitCells, type CellList } from './cell-list'
import { pooledHistogram, uniformEdges } from './histogram'
import { bootstrapOptions, checkBins, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'
import { ballVolume, checkWindow, describeWindow, inWindow, windowVolume, type Window } from './window'

/** Nearest-neighbour distance of every point of a cell list (Infinity for a single point). */
export function nearestNeighbourDistances(list: CellList): Float64Array {
  const { N, d, points } = list
  const out = new Float64Array(N).fill(Infinity)
  for (let i = 0; i < N; i++) {
    const y = points.subarray(i * d, i * d + d)
    let best = Infinity
    for (let ring = 0; ; ring++) {
      const any = visitCells(list, y, ring, (j) => {
        if (j === i) return
        const r2 = distance2(list, i, j)
        if (r2 < best) best = r2
      }, ring)
      if (!any) break
      if (Math.sqrt(best) <= ring * list.h) break
    }
    out[i] = Math.sqrt(best)
  }
  return out
}

export interface NearestNeighbourOptions extends ErrorBarOptions {
  /** Only points inside the window are centres (neighbours are searched among all points). */
  readonly window: Window
  readonly bins?: number
  /** Upper end of the histogram (default: 3 ρ^{−1/d}). */
  readonly rmax?: number
}

/** Histogram of nearest-neighbour distances over an ensemble, with the Poisson reference. */
export function nearestNeighbourDistribution(configs: readonly Configuration[], options: NearestNeighbourOptions): StatisticTable {
  const what = 'nearest-neighbour distances'
  const d = checkConfigurations(configs, what, [1, 2, 3])
  const win = options.window
  checkWindow(win, d, what)
  const bins = options.bins ?? 40
  checkBins(bins, what)
  const perConfig: Float64Array[] = []
  const rejected: Array<{ configuration: number, reason: string }> = []
  let inside = 0
  configs.forEach((c, m) => {
    if (c.N < 2) {
      rejected.push({ configuration: m, reason: 'fewer than two points' })
      return
    }
    const list = buildCellList(c.points, d, win.kind === 'torus' ? win.L : undefined)
    const r = nearestNeighbourDistances(list)
    const keep: number[] = []
    for (let i = 0; i < c.N; i++) if (inWindow(win, c.points, i * d, d)) keep.push(r[i])
    inside += keep.length
    perConfig.push(Float64Array.from(keep))
  })
  if (perConfig.length === 0) throw new EngineInputError(`${what}: no configuration has two points or more`)
  const M = perConfig.length
  const rho = inside / M / windowVolume(win, d)
  const rmax = options.rmax ?? 3 * Math.pow(rho, -1 / d)
  if (!(rmax > 0) || !Number.isFinite(rmax)) throw new EngineInputError(`${what}: rmax must be a finite number > 0 (got ${rmax})`)
  const edges = uniformEdges(0, rmax, bins)
  const hist = pooledHistogram(perConfig, edges, bootstrapOptions(options))
  const area = unitSphereArea(d)
  const rows = []
  for (let b = 0; b < bins; b++) {
    const r = (edges[b] + edges[b + 1]) / 2
    rows.push({
      r,
      density: hist.density.estimate[b],
      error: hist.density.error[b],
      lower: hist.density.lower[b],
      upper: hist.density.upper[b],
      poisson: rho * area * Math.pow(r, d - 1) * Math.exp(-rho * ballVolume(d, r)),
    })
  }
  let mean = 0
  let n = 0
  for (const v of perConfig) {
    for (const x of v) mean += x
    n += v.length
  }
  return makeTable({
    statistic: 'nearest-neighbour',
    parameters: { bins, rmax, d },
    convention: `centres in the ${describeWindow(win, d)}`,
    columns: [
      { name: 'r', description: 'bin centre (distance)' },
      { name: 'density', description: 'histogram density of nearest-neighbour distances' },
      { name: 'error', description: 'bootstrap standard error over configurations' },
      { name: 'lower', description: 'lower end of the bootstrap interval' },
      { name: 'upper', description: 'upper end of the bootstrap interval' },
      { name: 'poisson', description: 'density for a Poisson process of the same intensity' },
    ],
    rows,
    summary: { intensity: rho, meanDistance: mean / n, centres: n },
    errorBars: errorBarInfo(hist.density, M),
    configurations: M,
    rejected,
    notes: win.kind === 'ball' ? ['free space: centres near the window edge may find their neighbour outside it (all points are searched)'] : [],
  })
}
