// The pair correlation function g(r) of a stationary point process of intensity ρ, estimated in shells
// [r_b, r_{b+1}) of volume v_b = |B_{r_{b+1}}| − |B_{r_b}| (Illian, Penttinen, Stoyan & Stoyan,
// Statistical Analysis and Modelling of Spatial Point Patterns, 2008, §4.3.3–4.3.4):
//   torus [0, L)^d (exact, no edge):  ĝ_b = L^d / (N(N − 1) v_b) · Σ_{i≠j} 1{|x_i − x_j|_min ∈ bin},  r < L/2;
//   ball window W (Ripley's isotropic correction):
//     ĝ_b = |W| / (n(n − 1) v_b) · Σ_{i≠j ∈ W} 1{r_ij ∈ bin} / f(x_i, r_ij),
//     f(x, r) the fraction of the sphere ∂B(x, r) inside W: for W = B(c, R), ρ' = |x − c|,
//       d = 1: (number of x ± r in W)/2;
//       d = 2: 1 if r ≤ R − ρ', else arccos((r² + ρ'² − R²)/(2rρ'))/π;
//       d = 3: 1 if r ≤ R − ρ', else (R² − (ρ' − r)²)/(4ρ'r) (Archimedes' hat-box theorem);
//   ball window, reduced sample (minus sampling): only centres x_i with |x_i − c| ≤ R − r_max,
//     ĝ_b = Σ_{i centre} #{j : r_ij ∈ bin} / (n_c ρ̂ v_b),  ρ̂ = n/|W|.
// Error bars: the per-configuration numerators and normalisations are resampled together.
import type { Configuration } from '../types'
import { EngineInputError } from '../errors'
import { bootstrap } from './bootstrap'
import { buildCellList, forEachNeighbour } from './cell-list'
import { binOf, uniformEdges } from './histogram'
import { bootstrapOptions, checkBins, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'
import { ballVolume, checkWindow, describeWindow, distanceToCentre, windowVolume, type Window } from './window'

/** Fraction of the sphere ∂B(x, r) inside the ball B(c, R), x at distance rho from c ≤ R. */
export function sphereFractionInBall(d: number, rho: number, r: number, R: number): number {
  if (r <= R - rho) return 1
  if (r >= R + rho) return 0
  if (d === 1) return 0.5
  if (d === 2) {
    const c = (r * r + rho * rho - R * R) / (2 * r * rho)
    return Math.acos(Math.max(-1, Math.min(1, c))) / Math.PI
  }
  return (R * R - (rho - r) ** 2) / (4 * rho * r)
}

export interface PairCorrelationOptions extends ErrorBarOptions {
  readonly window: Window
  readonly bins?: number
  /** Largest distance (default: L/2 on the torus, R/2 for a ball window). */
  readonly rmax?: number
  /** Edge correction for a ball window (default 'ripley'). */
  readonly edge?: 'ripley' | 'reduced-sample'
  /** Optional reference curve: 'poisson' (g = 1) or 'ginibre' (g = 1 − exp(−πρr²), the 2-D plasma at β = 2). */
  readonly reference?: 'poisson' | 'ginibre'
}

/** g(r) over an ensemble with bootstrap error bars. */
export function pairCorrelation(configs: readonly Configuration[], options: PairCorrelationOptions): StatisticTable {
  const what = 'pair correlation'
  const d = checkConfigurations(configs, what, [1, 2, 3])
  const win = options.window
  checkWindow(win, d, what)
  const bins = options.bins ?? 50
  checkBins(bins, what)
  const rmax = options.rmax ?? (win.kind === 'torus' ? win.L / 2 : win.radius / 2)
  if (!(rmax > 0) || !Number.isFinite(rmax)) throw new EngineInputError(`${what}: rmax must be a finite number > 0 (got ${rmax})`)
  if (win.kind === 'torus' && rmax > win.L / 2) throw new EngineInputError(`${what}: on the torus rmax must be at most L/2 = ${win.L / 2} (got ${rmax})`)
  if (win.kind === 'ball' && rmax >= (options.edge === 'reduced-sample' ? win.radius : 2 * win.radius)) throw new EngineInputError(`${what}: rmax = ${rmax} is too large for the window radius ${win.radius}`)
  const edge = win.kind === 'torus' ? 'none' : options.edge ?? 'ripley'
  const edges = uniformEdges(0, rmax, bins)
  const shell = new Float64Array(bins)
  for (let b = 0; b < bins; b++) shell[b] = ballVolume(d, edges[b + 1]) - ballVolume(d, edges[b])
  const vol = windowVolume(win, d)
  const numer: Float64Array[] = []
  const norm: number[] = []
  const rejected: Array<{ configuration: number, reason: string }> = []
  let pointsUsed = 0
  configs.forEach((c, m) => {
    // Points of the window only.
    let pts = c.points
    if (win.kind === 'ball') {
      const keep: number[] = []
      for (let i = 0; i < c.N; i++) if (distanceToCentre(win, c.points, i * d, d) <= win.radius) for (let k = 0; k < d; k++) keep.push(c.points[i * d + k])
      pts = Float64Array.from(keep)
    }
    const n = pts.length / d
    if (n < 2) {
      rejected.push({ configuration: m, reason: 'fewer than two points in the window' })
      return
    }
    pointsUsed += n
    const list = buildCellList(pts, d, win.kind === 'torus' ? win.L : undefined, rmax)
    const counts = new Float64Array(bins)
    if (edge === 'reduced-sample' && win.kind === 'ball') {
      let centres = 0
      for (let i = 0; i < n; i++) {
        if (distanceToCentre(win, pts, i * d, d) > win.radius - rmax) continue
        centres++
        forEachNeighbour(list, i, rmax, (_j, r) => {
          const b = binOf(r, edges)
          if (b >= 0) counts[b]++
        })
      }
      if (centres === 0) {
        rejected.push({ configuration: m, reason: `no point lies at distance ≥ rmax from the window edge` })
        pointsUsed -= n
        return
      }
      numer.push(counts)
      norm.push(centres * (n / vol))
      return
    }
    for (let i = 0; i < n; i++) {
      const rho = win.kind === 'ball' ? distanceToCentre(win, pts, i * d, d) : 0
      forEachNeighbour(list, i, rmax, (_j, r) => {
        const b = binOf(r, edges)
        if (b < 0) return
        if (win.kind === 'ball') {
          const f = sphereFractionInBall(d, rho, r, win.radius)
          if (f > 0) counts[b] += 1 / f
        }
        else {
          counts[b] += 1
        }
      })
    }
    numer.push(counts)
    norm.push((n * (n - 1)) / vol)
  })
  if (numer.length === 0) throw new EngineInputError(`${what}: no configuration has two points or more in the window`)
  const M = numer.length
  const out = new Float64Array(bins)
  const result = bootstrap(M, (w) => {
    out.fill(0)
    let z = 0
    for (let m = 0; m < M; m++) {
      if (w[m] === 0) continue
      z += w[m] * norm[m]
      for (let b = 0; b < bins; b++) out[b] += w[m] * numer[m][b]
    }
    for (let b = 0; b < bins; b++) out[b] /= z * shell[b]
    return out
  }, bootstrapOptions(options))
  const rho = pointsUsed / M / vol
  const rows = []
  for (let b = 0; b < bins; b++) {
    const r = (edges[b] + edges[b + 1]) / 2
    const row: Record<string, number> = {
      r,
      g: result.estimate[b],
      error: result.error[b],
      lower: result.lower[b],
      upper: result.upper[b],
    }
    if (options.reference === 'poisson') row.reference = 1
    if (options.reference === 'ginibre') {
      // shell average of 1 − exp(−πρr²) in d = 2: exact integral over the annulus
      if (d !== 2) throw new EngineInputError(`${what}: the Ginibre reference is for points in the plane (d = ${d})`)
      const a = edges[b]
      const c = edges[b + 1]
      row.reference = 1 - (Math.exp(-Math.PI * rho * a * a) - Math.exp(-Math.PI * rho * c * c)) / (Math.PI * rho * (c * c - a * a))
    }
    rows.push(row)
  }
  return makeTable({
    statistic: 'pair-correlation',
    parameters: { bins, rmax, d, edge, ...(options.reference ? { reference: options.reference } : {}) },
    convention: `${describeWindow(win, d)}; edge correction: ${edge === 'none' ? 'none needed (periodic)' : edge}`,
    columns: [
      { name: 'r', description: 'bin centre (distance)' },
      { name: 'g', description: 'pair correlation, shell average' },
      { name: 'error', description: 'bootstrap standard error over configurations' },
      { name: 'lower', description: 'lower end of the bootstrap interval' },
      { name: 'upper', description: 'upper end of the bootstrap interval' },
      ...(options.reference ? [{ name: 'reference', description: options.reference === 'poisson' ? 'Poisson process: g = 1' : 'β = 2 plasma: shell average of 1 − exp(−πρr²)' }] : []),
    ],
    rows,
    summary: { intensity: rho },
    errorBars: errorBarInfo(result, M),
    configurations: M,
    rejected,
    notes: [],
  })
}
