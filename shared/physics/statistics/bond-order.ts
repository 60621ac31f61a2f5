// Bond-orientational order of planar points (Nelson & Halperin, Phys. Rev. B 19, 2457, 1979; Halperin &
// Nelson, Phys. Rev. Lett. 41, 121, 1978):
//   per point  ψ₆(x_i) = (1/n_i) Σ_{j ∈ N(i)} e^{6iθ_ij},   N(i) the Delaunay neighbours, θ_ij the angle of
//   x_j − x_i;  global  Ψ₆ = |(1/n) Σ_i ψ₆(x_i)|  and the mean local order ⟨|ψ₆|⟩.
// Points on the convex hull (free space) have incomplete neighbourhoods and are left out of both means
// (their count is reported); with a window, only points in the window count. A perfect triangular
// lattice has |ψ₆| = 1 at every interior point (geometry).
import type { Configuration } from '../types'
import { EngineInputError } from '../errors'
import { bootstrap } from './bootstrap'
import { tessellate } from './delaunay'
import { bootstrapOptions, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'
import { describeWindow, inWindow, type Window } from './window'

export interface BondOrderOptions extends ErrorBarOptions {
  /** A torus box, or a ball window in free space (default: all points). */
  readonly window?: Window
  /** The symmetry order (default 6). */
  readonly order?: number
  /** Include one row per point (default true). */
  readonly perPoint?: boolean
}

/** ψ_m of every point of one planar configuration (NaN for left-out points) and the left-out flags. */
export function localBondOrder(points: Float64Array, L: number | undefined, order = 6): { re: Float64Array, im: Float64Array, neighbours: Int32Array, leftOut: Uint8Array } {
  const t = tessellate(points, L)
  const N = t.N
  const re = new Float64Array(N).fill(Number.NaN)
  const im = new Float64Array(N).fill(Number.NaN)
  const neighbours = new Int32Array(N)
  const leftOut = new Uint8Array(N)
  for (let i = 0; i < N; i++) {
    const disp = t.displacements[i]
    const n = disp.length / 2
    neighbours[i] = n
    if (t.onHull[i] === 1 || n === 0) {
      leftOut[i] = 1
      continue
    }
    let sr = 0
    let si = 0
    for (let k = 0; k < n; k++) {
      const th = Math.atan2(disp[2 * k + 1], disp[2 * k])
      sr += Math.cos(order * th)
      si += Math.sin(order * th)
    }
    re[i] = sr / n
    im[i] = si / n
  }
  return { re, im, neighbours, leftOut }
}

/** ψ₆ per point and globally, with bootstrap error bars over configurations. */
export function bondOrientationalOrder(configs: readonly Configuration[], options: BondOrderOptions): StatisticTable {
  const what = 'bond-orientational order'
  checkConfigurations(configs, what, [2])
  const order = options.order ?? 6
  if (!Number.isInteger(order) || order < 1) throw new EngineInputError(`${what}: the symmetry order must be an integer ≥ 1 (got ${order})`)
  const win = options.window
  const L = win?.kind === 'torus' ? win.L : undefined
  const M = configs.length
  const sumRe = new Float64Array(M)
  const sumIm = new Float64Array(M)
  const sumAbs = new Float64Array(M)
  const count = new Float64Array(M)
  let leftOutTotal = 0
  const rows: Array<Record<string, number>> = []
  const perPoint = options.perPoint ?? true
  configs.forEach((c, m) => {
    let local
    try {
      local = localBondOrder(c.points, L, order)
    }
    catch (e) {
      if (e instanceof EngineInputError) throw new EngineInputError(`${what}, configuration ${m}: ${e.message}`, { ...e.where, configuration: m })
      throw e
    }
    for (let i = 0; i < c.N; i++) {
      const inside = win === undefined || inWindow(win, c.points, 2 * i, 2)
      const out = local.leftOut[i] === 1 || !inside
      if (out) leftOutTotal++
      else {
        sumRe[m] += local.re[i]
        sumIm[m] += local.im[i]
        sumAbs[m] += Math.hypot(local.re[i], local.im[i])
        count[m]++
      }
      if (perPoint) {
        rows.push({
          configuration: m,
          index: i,
          x: c.points[2 * i],
          y: c.points[2 * i + 1],
          re: local.re[i],
          im: local.im[i],
          abs: Math.hypot(local.re[i], local.im[i]),
          neighbours: local.neighbours[i],
          counted: out ? 0 : 1,
        })
      }
    }
  })
  if (count.every(n => n === 0)) throw new EngineInputError(`${what}: no point has a complete neighbourhood in the window`)
  const result = bootstrap(M, (w) => {
    let sr = 0
    let si = 0
    let sa = 0
    let n = 0
    for (let m = 0; m < M; m++) {
      sr += w[m] * sumRe[m]
      si += w[m] * sumIm[m]
      sa += w[m] * sumAbs[m]
      n += w[m] * count[m]
    }
    return [Math.hypot(sr, si) / n, sa / n]
  }, bootstrapOptions(options))
  // the global modulus of each configuration separately, averaged
  let perConfig = 0
  let used = 0
  for (let m = 0; m < M; m++) {
    if (count[m] > 0) {
      perConfig += Math.hypot(sumRe[m], sumIm[m]) / count[m]
      used++
    }
  }
  return makeTable({
    statistic: 'psi6',
    parameters: { order, perPoint },
    convention: `Delaunay neighbours; ${win ? describeWindow(win, 2) : 'all points in the plane'}; points of the convex hull left out`,
    columns: [
      { name: 'configuration', description: 'index of the configuration (0-based)' },
      { name: 'index', description: 'index of the point (0-based)' },
      { name: 'x', description: 'first coordinate' },
      { name: 'y', description: 'second coordinate' },
      { name: 're', description: 'real part of ψ (NaN when left out)' },
      { name: 'im', description: 'imaginary part of ψ' },
      { name: 'abs', description: '|ψ| of the point' },
      { name: 'neighbours', description: 'number of Delaunay neighbours' },
      { name: 'counted', description: '1 when the point enters the global means' },
    ],
    rows,
    summary: {
      global: result.estimate[0],
      globalError: result.error[0],
      meanLocal: result.estimate[1],
      meanLocalError: result.error[1],
      globalPerConfiguration: perConfig / used,
      leftOut: leftOutTotal,
    },
    errorBars: errorBarInfo(result, M),
    configurations: M,
    rejected: [],
    notes: [`${leftOutTotal} points left out (convex hull or outside the window)`, 'global: |Σ ψ| / n pooled over the ensemble; globalPerConfiguration: the mean over configurations of each one\'s |Σ ψ| / n'],
  })
}
