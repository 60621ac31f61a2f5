// Energies of point configurations in free space R^d and on the unit sphere S² (chordal distances):
//   pair sum  Σ_{i<j} g(x_i − x_j),   confinement  Σ_i V(x_i),
//   canonical energy  H = Σ_{i≠j} g(x_i − x_j) + N Σ_i V(x_i)   (the convention of this engine).
// The log kernel is summed as −½ Σ log|x_i − x_j|², multiplying the squared distances into a running
// product and taking one logarithm whenever the product leaves [1e−150, 1e150] (a factor outside that
// range is taken by its own logarithm), so few logarithms are evaluated and no product over- or
// underflows. All sums are compensated (Neumaier; see summation.ts). Sources: Saff & Kuijlaars,
// "Distributing many points on a sphere", Math. Intelligencer 19 (1997); Borodachov, Hardin & Saff,
// Discrete Energy on Rectifiable Sets (2019), ch. 2; Higham, Accuracy and Stability of Numerical
// Algorithms (2002), §4.3. Torus energies need the periodic Green function (Ewald summation) and are
// computed elsewhere.
import type { Configuration, Geometry, Kernel } from './types'
import type { Potential } from './potentials/types'
import type { EnergyConvention } from './conventions'
import { CANONICAL_CONVENTION, energyInConvention } from './conventions'
import { EngineInputError } from './errors'
import { assertKernel, kernelOfSquaredDistance } from './kernels'
import { CompensatedSum } from './summation'
import { ENGINE_VERSION } from './version'

const BLOCK = 128
const LOW = 1e-150
const HIGH = 1e150

/** Checks the shape and the numbers of a configuration; `d` (when given) is the required dimension. */
export function assertConfiguration(conf: Configuration, d?: number): void {
  const { N, points } = conf
  if (!Number.isInteger(N) || N < 0) throw new EngineInputError(`the number of points must be an integer ≥ 0 (got ${N})`)
  if (!Number.isInteger(conf.d) || conf.d < 1) throw new EngineInputError(`the dimension must be an integer ≥ 1 (got ${conf.d})`)
  if (d !== undefined && conf.d !== d) throw new EngineInputError(`the points have ${conf.d} coordinates but this geometry needs ${d}`)
  if (points.length !== N * conf.d) throw new EngineInputError(`expected ${N} points × ${conf.d} coordinates = ${N * conf.d} numbers, got ${points.length}`)
  for (let k = 0; k < points.length; k++) {
    if (!Number.isFinite(points[k])) {
      const index = Math.floor(k / conf.d)
      throw new EngineInputError(`point ${index} has a coordinate that is not a finite number (coordinate ${k % conf.d}: ${points[k]})`, { index })
    }
  }
}

/** The dimension of the coordinates in a geometry (3 on the sphere), after checking the kernel. */
function coordinateDimension(conf: Configuration, kernel: Kernel, geometry: Geometry): number {
  if (geometry.kind === 'torus') throw new EngineInputError('torus energies: use the Ewald summation (torus/ewald), the free-space pair sum does not apply on a torus')
  const d = geometry.kind === 'sphere' ? 3 : geometry.d
  assertConfiguration(conf, d)
  if (geometry.kind === 'sphere') {
    if (kernel.name === 'riesz' && !(kernel.s > 0 && Number.isFinite(kernel.s))) throw new EngineInputError(`the riesz exponent s must be a finite number > 0 (got ${kernel.s})`)
    return 3
  }
  try {
    assertKernel(kernel, d)
  }
  catch (e) {
    throw new EngineInputError(e instanceof Error ? e.message : String(e))
  }
  return d
}

function coincident(i: number, j: number): never {
  throw new EngineInputError(`points ${i} and ${j} coincide; the interaction energy is infinite`, { indices: [i, j] })
}

function squaredDistance(p: Float64Array, d: number, i: number, j: number): number {
  if (d === 1) {
    const dx = p[i] - p[j]
    return dx * dx
  }
  if (d === 2) {
    const dx = p[2 * i] - p[2 * j]
    const dy = p[2 * i + 1] - p[2 * j + 1]
    return dx * dx + dy * dy
  }
  if (d === 3) {
    const dx = p[3 * i] - p[3 * j]
    const dy = p[3 * i + 1] - p[3 * j + 1]
    const dz = p[3 * i + 2] - p[3 * j + 2]
    return dx * dx + dy * dy + dz * dz
  }
  let s = 0
  for (let k = 0; k < d; k++) {
    const dx = p[d * i + k] - p[d * j + k]
    s += dx * dx
  }
  return s
}

/** Σ_{i<j} log|x_i − x_j|² by blocked products of squared distances. */
function logProductSum(p: Float64Array, d: number, N: number): number {
  const total = new CompensatedSum()
  for (let bi = 0; bi < N; bi += BLOCK) {
    const iEnd = Math.min(N, bi + BLOCK)
    for (let bj = bi; bj < N; bj += BLOCK) {
      const jEnd = Math.min(N, bj + BLOCK)
      const logs = new CompensatedSum()
      let prod = 1
      for (let i = bi; i < iEnd; i++) {
        for (let j = Math.max(bj, i + 1); j < jEnd; j++) {
          const r2 = squaredDistance(p, d, i, j)
          if (r2 === 0) coincident(i, j)
          if (r2 < LOW || r2 > HIGH) {
            logs.add(Math.log(r2))
            continue
          }
          prod *= r2
          if (prod < LOW || prod > HIGH) {
            logs.add(Math.log(prod))
            prod = 1
          }
        }
      }
      if (prod !== 1) logs.add(Math.log(prod))
      total.addSum(logs)
    }
  }
  return total.value
}

function kernelSum(p: Float64Array, d: number, N: number, g: (r2: number) => number): number {
  const total = new CompensatedSum()
  for (let bi = 0; bi < N; bi += BLOCK) {
    const iEnd = Math.min(N, bi + BLOCK)
    for (let bj = bi; bj < N; bj += BLOCK) {
      const jEnd = Math.min(N, bj + BLOCK)
      // Neumaier's compensated sum, inlined for speed (see summation.ts)
      let sum = 0
      let comp = 0
      for (let i = bi; i < iEnd; i++) {
        for (let j = Math.max(bj, i + 1); j < jEnd; j++) {
          const r2 = squaredDistance(p, d, i, j)
          if (r2 === 0) coincident(i, j)
          const x = g(r2)
          const t = sum + x
          comp += Math.abs(sum) >= Math.abs(x) ? (sum - t) + x : (x - t) + sum
          sum = t
        }
      }
      total.add(sum).add(comp)
    }
  }
  return total.value
}

/** g(r²) with the common exponents written without Math.pow. */
function fastKernel(kernel: Kernel, d: number): (r2: number) => number {
  const s = kernel.name === 'coulomb' ? d - 2 : kernel.name === 'riesz' ? kernel.s : NaN
  if (s === 1) return r2 => 1 / Math.sqrt(r2)
  if (s === 2) return r2 => 1 / r2
  return kernelOfSquaredDistance(kernel, d)
}

/** Σ_{i<j} g(x_i − x_j) in free space R^d or on S² (points in R³, chordal distances).
 *  Coincident points raise an EngineInputError naming both indices. */
export function pairSum(conf: Configuration, kernel: Kernel, geometry: Geometry): number {
  const d = coordinateDimension(conf, kernel, geometry)
  if (conf.N < 2) return 0
  if (kernel.name === 'log') return -0.5 * logProductSum(conf.points, d, conf.N)
  return kernelSum(conf.points, d, conf.N, fastKernel(kernel, d))
}

/** The plain double loop Σ_{i<j} g(x_i − x_j), one kernel evaluation per pair, no compensation.
 *  A reference for tests and benchmarks. */
export function pairSumNaive(conf: Configuration, kernel: Kernel, geometry: Geometry): number {
  const d = coordinateDimension(conf, kernel, geometry)
  const g = kernelOfSquaredDistance(kernel, d)
  let s = 0
  for (let i = 0; i < conf.N; i++) {
    for (let j = i + 1; j < conf.N; j++) {
      const r2 = squaredDistance(conf.points, d, i, j)
      if (r2 === 0) coincident(i, j)
      s += g(r2)
    }
  }
  return s
}

/** Σ_i V(x_i), compensated. A value that is not finite raises an EngineInputError naming the point. */
export function confinement(conf: Configuration, potential: Potential): number {
  assertConfiguration(conf)
  if (potential.d !== conf.d) throw new EngineInputError(`the potential takes points of dimension ${potential.d} but the configuration has dimension ${conf.d}`)
  const acc = new CompensatedSum()
  for (let i = 0; i < conf.N; i++) {
    const v = potential.value(conf.points, i * conf.d)
    if (!Number.isFinite(v)) throw new EngineInputError(`the potential is not finite at point ${i} (V = ${v})`, { index: i })
    acc.add(v)
  }
  return acc.value
}

export interface EnergySetting {
  readonly kernel: Kernel
  readonly geometry: Geometry
  /** The external potential V (free space only; none means V = 0). */
  readonly potential?: Potential
}

export interface EnergyResult {
  readonly N: number
  /** Dimension of the coordinates (3 on the sphere). */
  readonly d: number
  /** Σ_{i<j} g(x_i − x_j) (canonical sign). */
  readonly pairSum: number
  /** Σ_i V(x_i) (0 without a potential). */
  readonly confinement: number
  /** Canonical energy Σ_{i≠j} g + N Σ V. */
  readonly H: number
  /** The energy in `convention`. */
  readonly Hconv: number
  readonly convention: EnergyConvention
  readonly engineVersion: string
}

/** Pair sum, confinement, the canonical energy H and the energy in a requested convention. */
export function energy(conf: Configuration, setting: EnergySetting, convention: EnergyConvention = CANONICAL_CONVENTION): EnergyResult {
  const { kernel, geometry, potential } = setting
  if (geometry.kind === 'sphere' && potential !== undefined) throw new EngineInputError('the sphere carries no external potential; leave the potential out')
  const ps = pairSum(conf, kernel, geometry)
  const conf0 = potential === undefined ? 0 : confinement(conf, potential)
  const N = conf.N
  if (N < 1) throw new EngineInputError('the configuration has no points')
  const d = geometry.kind === 'sphere' ? 3 : conf.d
  const parts = { pairSumOrdered: 2 * ps, confinement: conf0, N, d, kernel }
  return {
    N,
    d,
    pairSum: ps,
    confinement: conf0,
    H: energyInConvention(parts, CANONICAL_CONVENTION),
    Hconv: energyInConvention(parts, convention),
    convention,
    engineVersion: ENGINE_VERSION,
  }
}
