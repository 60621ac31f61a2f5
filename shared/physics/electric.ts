// Electric (truncated) energy of a configuration with smeared charges (sources below):
//   value = (1/c_d) ∫ |∇h_{N,η}|² = ∬ g d(Σ_i δ^{(η_i)}_{x_i} − Nμ)^{⊗2}
//         = Σ_{i≠j} ∬ g dδ^{(η_i)}_{x_i} dδ^{(η_j)}_{x_j} + Σ_i g(η_i) − 2N Σ_i ⟨h^μ⟩_{∂B(x_i,η_i)} + N² ∬ g dμ dμ,
// and the lower bound it gives for the next-order energy F_N (equality when the closed balls
// B(x_i, η_i) are pairwise disjoint):
//   F_N ≥ lowerBound = value − Σ_i g(η_i) − 2N Σ_i (h^μ(x_i) − ⟨h^μ⟩_{∂B(x_i,η_i)}).
// d = 2: g = −log|x|, c_2 = 2π; d = 3: g = 1/|x|, c_3 = 4π; d = 1: the line is embedded in the
// plane (points (x_i, 0), background μ(x₁)δ_{x₂=0}, c_2 = 2π), and the circle average of the
// planar potential of the line measure follows from Newton's theorem,
//   ⟨h^μ⟩_{∂B(x,η)} = ∫ −log max(|x − t|, η) dμ(t),  so  h^μ(x) − ⟨h^μ⟩ = ∫_{|t−x|<η} log(η/|x − t|) dμ(t),
// a one-dimensional integral over the line density done by adaptive Gauss–Kronrod quadrature
// (relative tolerance 1e-13). Smeared pair energies: smeared.ts. Sources: Sandier & Serfaty,
// Ann. Probab. 43 (2015); Petrache & Serfaty, J. Inst. Math. Jussieu 16 (2017)
// (truncation, the choice η_i = min(¼ r_i, N^(−1/d))).
import { EngineInputError } from './errors'
import { ENGINE_VERSION } from './version'
import { integrateAdaptive } from './quadrature'
import { smearedPairEnergy } from './smeared'
import { CompensatedSum as Sum } from './summation'
import type { Configuration } from './types'
import type { EquilibriumMeasure } from './equilibrium/types'

export type EtaRule
  = | { kind: 'fixed', eta: number }
  /** η_i = factor · N^(−1/d). */
    | { kind: 'scaled', factor: number }
  /** η_i = min(¼ r_i, N^(−1/d)), r_i the distance from x_i to its nearest neighbour. */
    | { kind: 'nn-capped' }

export interface ElectricResult {
  /** (1/c_d) ∫ |∇h_{N,η}|² = ∬ g d(Σ δ^{(η_i)}_{x_i} − Nμ)^{⊗2}. */
  readonly value: number
  readonly etas: Float64Array
  /** Number of unordered pairs with |x_i − x_j| < η_i + η_j. */
  readonly overlaps: number
  /** value − Σ g(η_i) − 2N Σ (h^μ(x_i) − ⟨h^μ⟩_{∂B(x_i,η_i)}) ≤ F_N. */
  readonly lowerBound: number
  readonly rule: EtaRule
  readonly N: number
  readonly d: number
  /** The four terms of `value`, in order: smeared pairs, Σ g(η_i), −2N Σ ⟨h^μ⟩, N² ∬ g dμ dμ. */
  readonly parts: { pairs: number, self: number, background: number, backgroundSelf: number }
  readonly engineVersion: string
}

/** Relative tolerance of the line-measure circle averages in d = 1. */
export const LINE_AVERAGE_TOLERANCE = 1e-13

// ---------------------------------------------------------------------------------------------
// Cell lists

interface Grid {
  d: number
  h: number
  lo: number[]
  dims: number[]
  start: Int32Array
  items: Int32Array
}

/** Uniform grid over the bounding box with cell side ≥ minSide (and not finer than ~N cells). */
function buildGrid(points: ArrayLike<number>, d: number, N: number, minSide: number): Grid {
  const lo: number[] = []
  const hi: number[] = []
  for (let c = 0; c < d; c++) {
    lo.push(Number.POSITIVE_INFINITY)
    hi.push(Number.NEGATIVE_INFINITY)
  }
  for (let i = 0; i < N; i++) {
    for (let c = 0; c < d; c++) {
      const v = points[i * d + c]
      if (v < lo[c]) lo[c] = v
      if (v > hi[c]) hi[c] = v
    }
  }
  let extent = 0
  for (let c = 0; c < d; c++) extent = Math.max(extent, hi[c] - lo[c])
  const perSide = Math.max(1, Math.ceil(Math.pow(N, 1 / d)))
  let h = Math.max(minSide, extent / perSide)
  if (!(h > 0)) h = 1
  const dims: number[] = []
  let cells = 1
  for (let c = 0; c < d; c++) {
    const n = Math.floor((hi[c] - lo[c]) / h) + 1
    dims.push(n)
    cells *= n
  }
  const cellOf = new Int32Array(N)
  const count = new Int32Array(cells + 1)
  for (let i = 0; i < N; i++) {
    let idx = 0
    for (let c = d - 1; c >= 0; c--) {
      const k = Math.min(dims[c] - 1, Math.floor((points[i * d + c] - lo[c]) / h))
      idx = idx * dims[c] + k
    }
    cellOf[i] = idx
    count[idx + 1]++
  }
  for (let k = 0; k < cells; k++) count[k + 1] += count[k]
  const fill = count.slice(0, cells)
  const items = new Int32Array(N)
  for (let i = 0; i < N; i++) items[fill[cellOf[i]]++] = i
  return { d, h, lo, dims, start: count, items }
}

function cellCoords(g: Grid, points: ArrayLike<number>, i: number): number[] {
  const out: number[] = []
  for (let c = 0; c < g.d; c++) out.push(Math.min(g.dims[c] - 1, Math.floor((points[i * g.d + c] - g.lo[c]) / g.h)))
  return out
}

/** Visits the cells whose index offset from `home` has Chebyshev norm exactly k. */
function forEachCellAtRing(g: Grid, home: number[], k: number, visit: (cell: number) => void): void {
  const d = g.d
  const off: number[] = new Array(d).fill(-k)
  for (;;) {
    let cheb = 0
    let inside = true
    let idx = 0
    for (let c = d - 1; c >= 0; c--) {
      cheb = Math.max(cheb, Math.abs(off[c]))
      const v = home[c] + off[c]
      if (v < 0 || v >= g.dims[c]) inside = false
      idx = idx * g.dims[c] + v
    }
    if (inside && cheb === k) visit(idx)
    let c = 0
    while (c < d && off[c] === k) {
      off[c] = -k
      c++
    }
    if (c === d) return
    off[c]++
  }
}

function dist2(points: ArrayLike<number>, d: number, i: number, j: number): number {
  let t = 0
  for (let c = 0; c < d; c++) {
    const u = points[i * d + c] - points[j * d + c]
    t += u * u
  }
  return t
}

/** Nearest-neighbour distances r_i (∞ when N = 1), by a cell list (no O(N²) search). */
export function nearestNeighbourDistances(points: ArrayLike<number>, d: number): Float64Array {
  const N = points.length / d
  const out = new Float64Array(N).fill(Number.POSITIVE_INFINITY)
  if (N < 2) return out
  const g = buildGrid(points, d, N, 0)
  const maxRing = Math.max(...g.dims)
  for (let i = 0; i < N; i++) {
    const home = cellCoords(g, points, i)
    let best = Number.POSITIVE_INFINITY
    for (let k = 0; k <= maxRing; k++) {
      forEachCellAtRing(g, home, k, (cell) => {
        for (let s = g.start[cell]; s < g.start[cell + 1]; s++) {
          const j = g.items[s]
          if (j === i) continue
          const r2 = dist2(points, d, i, j)
          if (r2 < best) best = r2
        }
      })
      // every point in a ring ≥ k + 1 is at distance ≥ k·h
      if (Math.sqrt(best) <= k * g.h) break
    }
    out[i] = Math.sqrt(best)
  }
  return out
}

/** Unordered pairs (i < j, flat) with |x_i − x_j| < η_i + η_j, found with a cell list. */
export function overlappingPairs(points: ArrayLike<number>, d: number, etas: ArrayLike<number>): Int32Array {
  const N = points.length / d
  let etaMax = 0
  for (let i = 0; i < N; i++) etaMax = Math.max(etaMax, etas[i])
  const g = buildGrid(points, d, N, 2 * etaMax)
  const pairs: number[] = []
  for (let i = 0; i < N; i++) {
    const home = cellCoords(g, points, i)
    for (let k = 0; k <= 1; k++) {
      forEachCellAtRing(g, home, k, (cell) => {
        for (let s = g.start[cell]; s < g.start[cell + 1]; s++) {
          const j = g.items[s]
          if (j <= i) continue
          const reach = etas[i] + etas[j]
          if (dist2(points, d, i, j) < reach * reach) pairs.push(i, j)
        }
      })
    }
  }
  return Int32Array.from(pairs)
}

// ---------------------------------------------------------------------------------------------
// Radii

/** The radii η_i of a rule. */
export function smearingRadii(conf: Configuration, rule: EtaRule): Float64Array {
  const { N, d } = conf
  const scale = Math.pow(N, -1 / d)
  const etas = new Float64Array(N)
  if (rule.kind === 'fixed') {
    if (!(rule.eta > 0 && Number.isFinite(rule.eta))) throw new EngineInputError(`the smearing radius η must be a finite number > 0 (got ${rule.eta})`)
    etas.fill(rule.eta)
  }
  else if (rule.kind === 'scaled') {
    if (!(rule.factor > 0 && Number.isFinite(rule.factor))) throw new EngineInputError(`the smearing factor must be a finite number > 0 (got ${rule.factor})`)
    etas.fill(rule.factor * scale)
  }
  else if (rule.kind === 'nn-capped') {
    const r = nearestNeighbourDistances(conf.points, d)
    for (let i = 0; i < N; i++) {
      if (!(r[i] > 0)) {
        const j = findCoincident(conf, i)
        throw new EngineInputError(`points ${i} and ${j} coincide, so the nearest-neighbour radius of point ${i} is 0`, { indices: [i, j] })
      }
      etas[i] = Math.min(0.25 * r[i], scale)
    }
  }
  else {
    throw new EngineInputError(`unknown smearing rule ${JSON.stringify(rule)}`)
  }
  return etas
}

function findCoincident(conf: Configuration, i: number): number {
  for (let j = 0; j < conf.N; j++) if (j !== i && dist2(conf.points, conf.d, i, j) === 0) return j
  return i
}

// ---------------------------------------------------------------------------------------------
// Background: circle averages of the planar potential of a line measure (d = 1)

function supportIntervals(measure: EquilibriumMeasure): Array<[number, number]> {
  const s = measure.support
  if (s.kind === 'ball') return [[s.center[0] - s.radius, s.center[0] + s.radius]]
  if (s.kind === 'intervals') return s.intervals
  throw new EngineInputError(`a measure on the line needs a support of intervals (got '${s.kind}')`)
}

/** h^μ(x) − ⟨h^μ⟩_{∂B((x,0),η)} = ∫_{|t−x|<η} log(η/|x − t|) dμ(t) for a measure μ on the line. */
export function lineAverageDefect(measure: EquilibriumMeasure, x: number, eta: number): number {
  const buf = new Float64Array(1)
  const rho = (t: number): number => {
    buf[0] = t
    return measure.density(buf, 0)
  }
  const opts = { relTol: LINE_AVERAGE_TOLERANCE, absTol: 1e-17 }
  let total = 0
  for (const [A, B] of supportIntervals(measure)) {
    for (const side of [1, -1]) {
      const u0 = side === 1 ? Math.max(A, x) - x : x - Math.min(B, x)
      const u1 = side === 1 ? Math.min(B, x + eta) - x : x - Math.max(A, x - eta)
      if (!(u1 > u0)) continue
      if (u0 === 0) {
        // u = u1 e^{−σ}: removes the logarithmic singularity at u = 0; the tail beyond σ = 45 is < e^{−45}
        const logRatio = Math.log(eta / u1)
        total += integrateAdaptive((sg) => {
          const u = u1 * Math.exp(-sg)
          return u * rho(x + side * u) * (logRatio + sg)
        }, 0, 45, opts).value
      }
      else {
        total += integrateAdaptive(u => rho(x + side * u) * Math.log(eta / u), u0, u1, opts).value
      }
    }
  }
  return total
}

// ---------------------------------------------------------------------------------------------

function checkInput(conf: Configuration, measure: EquilibriumMeasure): void {
  const { N, d, points } = conf
  if (d !== 1 && d !== 2 && d !== 3) throw new EngineInputError(`the electric energy is defined here for d = 1, 2, 3 (got d = ${d})`)
  if (!(Number.isInteger(N) && N >= 1)) throw new EngineInputError(`the configuration needs at least one point (got N = ${N})`)
  if (points.length !== N * d) throw new EngineInputError(`the configuration declares N = ${N} points of dimension ${d} but holds ${points.length} numbers`)
  for (let k = 0; k < points.length; k++) {
    if (!Number.isFinite(points[k])) throw new EngineInputError(`coordinate ${k % d} of point ${Math.floor(k / d)} is not a finite number`, { index: Math.floor(k / d) })
  }
  if (measure.d !== d) throw new EngineInputError(`the equilibrium measure lives in dimension ${measure.d} but the configuration in dimension ${d}`)
  const kernel = measure.kernel
  const coulomb3 = kernel.name === 'coulomb' || (kernel.name === 'riesz' && kernel.s === 1)
  if (d <= 2 && kernel.name !== 'log') throw new EngineInputError(`the electric energy in d = ${d} needs the log kernel (got '${kernel.name}')`)
  if (d === 3 && !coulomb3) throw new EngineInputError(`the electric energy in d = 3 needs the coulomb kernel 1/|x| (got '${kernel.name}')`)
}

/** The electric energy of a configuration for the smearing radii of `rule` (see the header). */
export function electricEnergy(conf: Configuration, measure: EquilibriumMeasure, { rule, pairSum }: {
  rule: EtaRule
  /** Σ_{i<j} g(x_i − x_j) when the caller has it already (e.g. from fast/choose.ts); else summed directly. */
  pairSum?: number
}): ElectricResult {
  checkInput(conf, measure)
  const { N, d, points } = conf
  const etas = smearingRadii(conf, rule)
  const pd: 2 | 3 = d === 3 ? 3 : 2
  const g = pd === 3 ? (r: number) => 1 / r : (r: number) => -Math.log(r)

  // Σ_{i≠j} g(x_i − x_j): the caller's sum, or the direct one
  const pairG = new Sum()
  if (pairSum !== undefined) {
    if (!Number.isFinite(pairSum)) throw new EngineInputError(`the given pair sum is not a finite number (got ${pairSum})`)
    pairG.add(2 * pairSum)
  }
  for (let i = 0; i < N && pairSum === undefined; i++) {
    for (let j = i + 1; j < N; j++) {
      const r2 = dist2(points, d, i, j)
      if (r2 === 0) throw new EngineInputError(`points ${i} and ${j} coincide: the next-order energy is infinite`, { indices: [i, j] })
      pairG.add(2 * g(Math.sqrt(r2)))
    }
  }
  // overlapping pairs: exact smeared interaction instead of g
  const pairs = overlappingPairs(points, d, etas)
  const correction = new Sum()
  for (let p = 0; p < pairs.length; p += 2) {
    const i = pairs[p]
    const j = pairs[p + 1]
    const D = Math.sqrt(dist2(points, d, i, j))
    correction.add(2 * (smearedPairEnergy(pd, D, etas[i], etas[j]) - g(D)))
  }
  const self = new Sum()
  for (let i = 0; i < N; i++) self.add(g(etas[i]))
  const hSum = new Sum()
  const defect = new Sum()
  for (let i = 0; i < N; i++) {
    const h = measure.potential(points, i * d)
    hSum.add(h)
    defect.add(d === 1 ? lineAverageDefect(measure, points[i], etas[i]) : h - measure.sphereAverage(points, i * d, etas[i]))
  }
  const pairsTotal = pairG.value + correction.value
  const avgTotal = hSum.value - defect.value
  const backgroundSelf = N * N * measure.selfEnergy
  const value = pairsTotal + self.value - 2 * N * avgTotal + backgroundSelf
  const lowerBound = pairsTotal - 2 * N * hSum.value + backgroundSelf
  return {
    value,
    etas,
    overlaps: pairs.length / 2,
    lowerBound,
    rule,
    N,
    d,
    parts: { pairs: pairsTotal, self: self.value, background: -2 * N * avgTotal, backgroundSelf },
    engineVersion: ENGINE_VERSION,
  }
}

/** F_N − lowerBound: ≥ 0, and 0 up to rounding when all balls B(x_i, η_i) are disjoint. */
export function electricGap(FN: number, result: ElectricResult): number {
  return FN - result.lowerBound
}
