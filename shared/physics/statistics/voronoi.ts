// Voronoi cell areas of planar points (Okabe, Boots, Sugihara & Chiu, Spatial Tessellations, 2nd ed.
// 2000, §2.2 and §5.5 for the Poisson–Voronoi cell: mean area 1/ρ). The cells come from the Delaunay
// triangulation (delaunay.ts). In free space the unbounded cells of the convex hull are dropped, and with a
// ball window so are the cells with a vertex outside it; every dropped cell is counted. On the periodic
// box the cells tile the box, so their areas sum to L². Areas can be reported in units of the mean area
// per point, 1/ρ.
import type { Configuration } from '../types'
import { EngineInputError } from '../errors'
import { tessellate } from './delaunay'
import { pooledHistogram, uniformEdges } from './histogram'
import { bootstrapOptions, checkBins, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'
import { describeWindow, type Window } from './window'

export interface VoronoiOptions extends ErrorBarOptions {
  readonly window?: Window
  readonly bins?: number
  /** Divide areas by the mean kept area (default false). */
  readonly normalise?: boolean
  /** Include one row per cell instead of the histogram (default false). */
  readonly perCell?: boolean
}

/** Voronoi areas of the kept cells of one configuration (NaN for dropped cells). */
export function voronoiAreas(points: Float64Array, win?: Window): { areas: Float64Array, dropped: number } {
  const t = tessellate(points, win?.kind === 'torus' ? win.L : undefined)
  const areas = Float64Array.from(t.areas)
  let dropped = 0
  for (let i = 0; i < t.N; i++) {
    if (Number.isNaN(areas[i])) {
      dropped++
      continue
    }
    if (win?.kind === 'ball') {
      const v = t.cells[i]
      for (let k = 0; k < v.length; k += 2) {
        if (Math.hypot(v[k] - win.center[0], v[k + 1] - win.center[1]) > win.radius) {
          areas[i] = Number.NaN
          dropped++
          break
        }
      }
    }
  }
  return { areas, dropped }
}

/** Histogram (or per-cell table) of Voronoi cell areas with bootstrap error bars. */
export function voronoiCellAreas(configs: readonly Configuration[], options: VoronoiOptions): StatisticTable {
  const what = 'Voronoi cell areas'
  checkConfigurations(configs, what, [2])
  const win = options.window
  if (win?.kind === 'ball' && win.center.length !== 2) throw new EngineInputError(`${what}: the window centre must have 2 coordinates`)
  const bins = options.bins ?? 40
  checkBins(bins, what)
  const M = configs.length
  const perConfig: Float64Array[] = []
  const cellRows: Array<Record<string, number>> = []
  let dropped = 0
  let kept = 0
  let sum = 0
  configs.forEach((c, m) => {
    let r
    try {
      r = voronoiAreas(c.points, win)
    }
    catch (e) {
      if (e instanceof EngineInputError) throw new EngineInputError(`${what}, configuration ${m}: ${e.message}`, { ...e.where, configuration: m })
      throw e
    }
    dropped += r.dropped
    const v: number[] = []
    r.areas.forEach((a, i) => {
      if (!Number.isNaN(a)) {
        v.push(a)
        sum += a
        kept++
      }
      if (options.perCell) cellRows.push({ configuration: m, index: i, x: c.points[2 * i], y: c.points[2 * i + 1], area: a })
    })
    perConfig.push(Float64Array.from(v))
  })
  if (kept === 0) throw new EngineInputError(`${what}: every cell was dropped (unbounded or outside the window)`)
  const meanArea = sum / kept
  const scale = options.normalise ? 1 / meanArea : 1
  const values = perConfig.map(v => v.map(a => a * scale))
  let hi = 0
  for (const v of values) for (const a of v) hi = Math.max(hi, a)
  const edges = uniformEdges(0, hi * (1 + 1e-9) + (hi === 0 ? 1 : 0), bins)
  const hist = pooledHistogram(values, edges, bootstrapOptions(options))
  let ss = 0
  for (const v of perConfig) for (const a of v) ss += (a - meanArea) ** 2
  const rows = options.perCell
    ? cellRows
    : Array.from({ length: bins }, (_, b) => ({
        area: (edges[b] + edges[b + 1]) / 2,
        density: hist.density.estimate[b],
        error: hist.density.error[b],
        lower: hist.density.lower[b],
        upper: hist.density.upper[b],
        count: hist.counts[b],
      }))
  return makeTable({
    statistic: 'voronoi',
    parameters: { bins, normalise: options.normalise ?? false, perCell: options.perCell ?? false },
    convention: `${win ? describeWindow(win, 2) : 'all points in the plane'}; unbounded cells${win?.kind === 'ball' ? ' and cells leaving the window' : ''} dropped`,
    columns: options.perCell
      ? [
          { name: 'configuration', description: 'index of the configuration (0-based)' },
          { name: 'index', description: 'index of the point (0-based)' },
          { name: 'x', description: 'first coordinate' },
          { name: 'y', description: 'second coordinate' },
          { name: 'area', description: 'Voronoi cell area (NaN when dropped)' },
        ]
      : [
          { name: 'area', description: options.normalise ? 'bin centre (area / mean area)' : 'bin centre (area)' },
          { name: 'density', description: 'histogram density of cell areas' },
          { name: 'error', description: 'bootstrap standard error over configurations' },
          { name: 'lower', description: 'lower end of the bootstrap interval' },
          { name: 'upper', description: 'upper end of the bootstrap interval' },
          { name: 'count', description: 'pooled number of cells in the bin' },
        ],
    rows,
    summary: { meanArea, areaVariance: kept > 1 ? ss / (kept - 1) : Number.NaN, kept, dropped },
    errorBars: errorBarInfo(hist.density, M),
    configurations: M,
    rejected: [],
    notes: [`${dropped} cells dropped (unbounded${win?.kind === 'ball' ? ' or leaving the window' : ''})`],
  })
}
