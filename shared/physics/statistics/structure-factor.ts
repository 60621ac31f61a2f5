// The structure factor S(k) = |Σ_j e^{i k·x_j}|² / N (Hansen & McDonald, Theory of Simple Liquids,
// 4th ed. 2013, §4.1; Torquato, Phys. Rep. 745, 2018, §2 for hyperuniformity, S(k) → 0 as k → 0).
//   torus [0, L)^d: at the reciprocal-lattice vectors k = (2π/L) n, n ∈ Z^d \ {0}, |k| ≤ k_max, and
//     averaged over the vectors whose |k| falls in each radial bin (d = 2, 3; in d = 1 each |n| is a bin);
//     for N independent uniform points E S(k) = 1 exactly at every such k;
//   free space: at chosen magnitudes |k|, averaged over directions (d = 1: ±k; d = 2: evenly spaced
//     angles; d = 3: a Fibonacci set of directions); no background is subtracted, so the finite sample
//     adds a window term near k = 0.
// The powers e^{i(2π/L)n x} are built by repeated multiplication per coordinate. Error bars: bootstrap
// over configurations of the per-configuration bin averages.
import type { Configuration } from '../types'
import { EngineInputError } from '../errors'
import { bootstrap } from './bootstrap'
import { bootstrapOptions, checkBins, checkConfigurations, errorBarInfo, makeTable, type ErrorBarOptions, type StatisticTable } from './table'

export interface TorusStructureFactorOptions extends ErrorBarOptions {
  readonly L: number
  /** Largest |n| = |k| L / (2π) used (default 20). */
  readonly nmax?: number
  /** Radial bins of |k| (d = 2, 3; default nmax). */
  readonly bins?: number
}

/** S(k) at one wave vector for one configuration. */
export function structureFactorAt(config: Configuration, k: ArrayLike<number>): number {
  const { N, d, points } = config
  let re = 0
  let im = 0
  for (let i = 0; i < N; i++) {
    let phase = 0
    for (let c = 0; c < d; c++) phase += k[c] * points[i * d + c]
    re += Math.cos(phase)
    im += Math.sin(phase)
  }
  return (re * re + im * im) / N
}

/** Radially binned S(k) on the torus. */
export function torusStructureFactor(configs: readonly Configuration[], options: TorusStructureFactorOptions): StatisticTable {
  const what = 'structure factor'
  const d = checkConfigurations(configs, what, [1, 2, 3])
  const L = options.L
  if (!(L > 0) || !Number.isFinite(L)) throw new EngineInputError(`${what}: the box side L must be a finite number > 0 (got ${L})`)
  const nmax = options.nmax ?? 20
  if (!Number.isInteger(nmax) || nmax < 1 || nmax > (d === 1 ? 100000 : d === 2 ? 400 : 60)) throw new EngineInputError(`${what}: nmax must be an integer between 1 and ${d === 1 ? 100000 : d === 2 ? 400 : 60} in d = ${d} (got ${nmax})`)
  const bins = d === 1 ? nmax : options.bins ?? nmax
  checkBins(bins, what)
  const k0 = (2 * Math.PI) / L
  const kmax = k0 * nmax
  // Half the lattice suffices: S(−k) = S(k). Take n with the first non-zero coordinate positive.
  const vectors: number[][] = []
  const range = (lo: number) => {
    const a: number[] = []
    for (let v = lo; v <= nmax; v++) a.push(v)
    return a
  }
  const full = range(-nmax)
  if (d === 1) for (let a = 1; a <= nmax; a++) vectors.push([a])
  else if (d === 2) {
    for (const a of full) for (const b of full) if ((a > 0 || (a === 0 && b > 0)) && a * a + b * b <= nmax * nmax) vectors.push([a, b])
  }
  else {
    for (const a of full) for (const b of full) for (const c of full) {
      if ((a > 0 || (a === 0 && (b > 0 || (b === 0 && c > 0)))) && a * a + b * b + c * c <= nmax * nmax) vectors.push([a, b, c])
    }
  }
  const binOfVector = vectors.map((n) => {
    const kn = k0 * Math.sqrt(n.reduce((s, x) => s + x * x, 0))
    if (d === 1) return n[0] - 1
    return Math.min(bins - 1, Math.floor((kn / kmax) * bins - 1e-12))
  })
  const perBin = new Float64Array(bins)
  for (const b of binOfVector) perBin[b]++
  const M = configs.length
  const values: Float64Array[] = []
  for (const c of configs) {
    const { N, points } = c
    if (N === 0) throw new EngineInputError(`${what}: a configuration has no points`)
    // e^{i k0 m x_c} for m = −nmax … nmax, per point and coordinate
    const width = 2 * nmax + 1
    const re = new Float64Array(N * d * width)
    const im = new Float64Array(N * d * width)
    for (let i = 0; i < N; i++) {
      for (let q = 0; q < d; q++) {
        const base = (i * d + q) * width + nmax
        const cr = Math.cos(k0 * points[i * d + q])
        const ci = Math.sin(k0 * points[i * d + q])
        re[base] = 1
        im[base] = 0
        for (let m = 1; m <= nmax; m++) {
          if (m % 16 === 0) {
            // refresh from the exact value to stop rounding from accumulating
            re[base + m] = Math.cos(k0 * m * points[i * d + q])
            im[base + m] = Math.sin(k0 * m * points[i * d + q])
          }
          else {
            re[base + m] = re[base + m - 1] * cr - im[base + m - 1] * ci
            im[base + m] = re[base + m - 1] * ci + im[base + m - 1] * cr
          }
          re[base - m] = re[base + m]
          im[base - m] = -im[base + m]
        }
      }
    }
    const acc = new Float64Array(bins)
    for (let v = 0; v < vectors.length; v++) {
      const n = vectors[v]
      let sr = 0
      let si = 0
      for (let i = 0; i < N; i++) {
        let pr = 1
        let pi = 0
        for (let q = 0; q < d; q++) {
          const idx = (i * d + q) * width + nmax + n[q]
          const tr = pr * re[idx] - pi * im[idx]
          pi = pr * im[idx] + pi * re[idx]
          pr = tr
        }
        sr += pr
        si += pi
      }
      acc[binOfVector[v]] += (sr * sr + si * si) / N
    }
    for (let b = 0; b < bins; b++) acc[b] = perBin[b] > 0 ? acc[b] / perBin[b] : Number.NaN
    values.push(acc)
  }
  const out = new Float64Array(bins)
  const result = bootstrap(M, (w) => {
    out.fill(0)
    let t = 0
    for (let m = 0; m < M; m++) {
      t += w[m]
      for (let b = 0; b < bins; b++) out[b] += w[m] * values[m][b]
    }
    for (let b = 0; b < bins; b++) out[b] /= t
    return out
  }, bootstrapOptions(options))
  const rows = []
  for (let b = 0; b < bins; b++) {
    if (perBin[b] === 0) continue
    let ksum = 0
    for (let v = 0; v < vectors.length; v++) if (binOfVector[v] === b) ksum += k0 * Math.sqrt(vectors[v].reduce((s, x) => s + x * x, 0))
    rows.push({ k: ksum / perBin[b], S: result.estimate[b], error: result.error[b], lower: result.lower[b], upper: result.upper[b], vectors: perBin[b] })
  }
  return makeTable({
    statistic: 'structure-factor',
    parameters: { L, nmax, bins, d },
    convention: `S(k) = |Σ_j e^{ik·x_j}|²/N at k = 2πn/L, n ≠ 0, on the periodic box [0, ${L})^${d}; radial bins of |k| ≤ ${kmax}`,
    columns: [
      { name: 'k', description: 'mean |k| of the wave vectors in the bin' },
      { name: 'S', description: 'structure factor averaged over the bin and the configurations' },
      { name: 'error', description: 'bootstrap standard error over configurations' },
      { name: 'lower', description: 'lower end of the bootstrap interval' },
      { name: 'upper', description: 'upper end of the bootstrap interval' },
      { name: 'vectors', description: 'number of wave vectors (up to k ↔ −k) in the bin' },
    ],
    rows,
    summary: { waveVectors: vectors.length },
    errorBars: errorBarInfo(result, M),
    configurations: M,
    rejected: [],
    notes: ['S(−k) = S(k): each pair ±k is counted once'],
  })
}

export interface FreeStructureFactorOptions extends ErrorBarOptions {
  /** Magnitudes |k| at which S is evaluated. */
  readonly k: readonly number[]
  /** Directions averaged per magnitude (d = 2: angles in [0, π); d = 3: Fibonacci points; default 32). */
  readonly directions?: number
}

function directionSet(d: number, count: number): number[][] {
  if (d === 1) return [[1]]
  if (d === 2) {
    const out: number[][] = []
    for (let j = 0; j < count; j++) out.push([Math.cos((Math.PI * j) / count), Math.sin((Math.PI * j) / count)])
    return out
  }
  // Fibonacci points on the upper half sphere (S(−k) = S(k))
  const out: number[][] = []
  const golden = Math.PI * (3 - Math.sqrt(5))
  for (let j = 0; j < count; j++) {
    const z = 1 - (j + 0.5) / count
    const r = Math.sqrt(1 - z * z)
    out.push([r * Math.cos(golden * j), r * Math.sin(golden * j), z])
  }
  return out
}

/** S(k) of free-space samples at chosen |k|, averaged over directions. */
export function freeStructureFactor(configs: readonly Configuration[], options: FreeStructureFactorOptions): StatisticTable {
  const what = 'structure factor'
  const d = checkConfigurations(configs, what, [1, 2, 3])
  const ks = options.k
  if (ks.length === 0) throw new EngineInputError(`${what}: give at least one |k|`)
  ks.forEach((k, j) => {
    if (!(k > 0) || !Number.isFinite(k)) throw new EngineInputError(`${what}: |k| number ${j + 1} must be a finite number > 0 (got ${k})`)
  })
  const count = options.directions ?? 32
  if (!Number.isInteger(count) || count < 1 || count > 4096) throw new EngineInputError(`${what}: the number of directions must be an integer between 1 and 4096 (got ${count})`)
  const dirs = directionSet(d, count)
  const M = configs.length
  const values = configs.map((c) => {
    if (c.N === 0) throw new EngineInputError(`${what}: a configuration has no points`)
    return Float64Array.from(ks, (k) => {
      let s = 0
      for (const u of dirs) s += structureFactorAt(c, u.map(x => x * k))
      return s / dirs.length
    })
  })
  const K = ks.length
  const out = new Float64Array(K)
  const result = bootstrap(M, (w) => {
    out.fill(0)
    let t = 0
    for (let m = 0; m < M; m++) {
      t += w[m]
      for (let j = 0; j < K; j++) out[j] += w[m] * values[m][j]
    }
    for (let j = 0; j < K; j++) out[j] /= t
    return out
  }, bootstrapOptions(options))
  return makeTable({
    statistic: 'structure-factor',
    parameters: { directions: dirs.length, d },
    convention: 'S(k) = |Σ_j e^{ik·x_j}|²/N of free-space points, averaged over directions of k',
    columns: [
      { name: 'k', description: '|k|' },
      { name: 'S', description: 'structure factor averaged over directions and configurations' },
      { name: 'error', description: 'bootstrap standard error over configurations' },
      { name: 'lower', description: 'lower end of the bootstrap interval' },
      { name: 'upper', description: 'upper end of the bootstrap interval' },
    ],
    rows: ks.map((k, j) => ({ k, S: result.estimate[j], error: result.error[j], lower: result.lower[j], upper: result.upper[j] })),
    summary: {},
    errorBars: errorBarInfo(result, M),
    configurations: M,
    rejected: [],
    notes: ['free space: the finite sample adds a window term near k = 0 (no background is subtracted)'],
  })
}
