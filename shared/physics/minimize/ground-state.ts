// Ground states (β = ∞): minimisers of the canonical energy H = Σ_{i≠j} g(x_i − x_j) + N Σ V(x_i)
// (the convention of this engine) by L-BFGS (minimize/lbfgs.ts) from several seeded random starts,
// keeping the best.
// - Free space: the coordinates themselves.
// - Sphere: unconstrained coordinates y_i ∈ R³ \ {0} and the objective H(y_1/|y_1|, …, y_N/|y_N|); its
//   gradient is (I − u_i u_iᵀ)∇_{u_i}H / |y_i| with u_i = y_i/|y_i| (chain rule), so the search moves
//   along the sphere and the result is projected at the end (a retraction in the sense of Absil, Mahony &
//   Sepulchre, Optimization Algorithms on Matrix Manifolds, 2008, §4.1).
// - Torus: the coordinates, wrapped into [0, L)^d after the search; H_T and its gradient in closed form
//   from one Ewald sum (torus/ewald.ts, torusEnergyAndGradient), O(N^{3/2}) per step with the sum over
//   wave vectors and O(N log N) on the mesh.
// The spread of the restarts (minimum, maximum, and the distinct local minima found, equal up to a relative
// tolerance) is reported, since energy landscapes of this kind have many local minima (Wales, McKay &
// Altschuler, Phys. Rev. B 79, 2009).
import type { Configuration, Geometry, Kernel } from '../types'
import type { Potential } from '../potentials/types'
import type { Rng } from '../random'
import { EngineInputError } from '../errors'
import { CANONICAL_CONVENTION } from '../conventions'
import type { EnergyConvention } from '../conventions'
import { ENGINE_VERSION } from '../version'
import { energy } from '../energy'
import { torusEnergy, torusEnergyAndGradient } from '../torus/ewald'
import { coordinateDimension, energyAndGradient, radialKernel, torusLattice } from '../samplers/forces'
import { lbfgs } from './lbfgs'
import type { LbfgsOptions } from './lbfgs'

export interface GroundStateOptions {
  readonly N: number
  readonly kernel: Kernel
  readonly geometry: Geometry
  /** External potential (free space only, required there). */
  readonly potential?: Potential
  /** Number of random starts (default 10). */
  readonly restarts?: number
  /** Starting configurations to try before the random ones (flat coordinates). */
  readonly starts?: Float64Array[]
  /** Two minima are the same when their energies differ by at most this times max(1, |H|) (default 1e−9). */
  readonly distinctTolerance?: number
  readonly lbfgs?: LbfgsOptions
  /** Called after each start with (starts done, starts in total). */
  readonly onProgress?: (done: number, total: number) => void
  /** Ewald tolerance on the torus (default 1e−12). */
  readonly ewaldTolerance?: number
}

export interface GroundStateRun {
  /** Canonical H at the end of this start. */
  readonly energy: number
  readonly iterations: number
  readonly gradientNorm: number
  readonly converged: boolean
}

export interface GroundStateResult {
  readonly best: Configuration
  /** Canonical energy H of the best configuration. */
  readonly energy: number
  /** Σ_{i<j} g(x_i − x_j) of the best configuration (for the torus: Σ_{i<j} G + ½ N c₀, i.e. H_T / 2). */
  readonly pairSum: number
  readonly convention: EnergyConvention
  readonly runs: GroundStateRun[]
  readonly spread: {
    readonly min: number
    readonly max: number
    /** Distinct minima (energy, how many starts reached it), lowest first. */
    readonly distinct: Array<{ energy: number, count: number }>
  }
  readonly parametrisation: 'cartesian' | 'sphere-projected' | 'torus-wrapped'
  readonly engineVersion: string
}

function randomStart(geometry: Geometry, N: number, d: number, rng: Rng): Float64Array {
  const p = new Float64Array(N * d)
  if (geometry.kind === 'torus') {
    for (let k = 0; k < p.length; k++) p[k] = rng.uniform() * geometry.L
    return p
  }
  for (let k = 0; k < p.length; k++) p[k] = rng.normal() * (geometry.kind === 'sphere' ? 1 : 0.5)
  if (geometry.kind === 'sphere') {
    for (let i = 0; i < N; i++) {
      const r = Math.hypot(p[3 * i], p[3 * i + 1], p[3 * i + 2])
      for (let k = 0; k < 3; k++) p[3 * i + k] /= r
    }
  }
  return p
}

function projectToSphere(y: Float64Array, N: number): Float64Array {
  const u = new Float64Array(3 * N)
  for (let i = 0; i < N; i++) {
    const r = Math.hypot(y[3 * i], y[3 * i + 1], y[3 * i + 2])
    for (let k = 0; k < 3; k++) u[3 * i + k] = y[3 * i + k] / r
  }
  return u
}

/** The lowest energy found from `restarts` seeded starts (plus any given starts). */
export function groundState(options: GroundStateOptions, rng: Rng): GroundStateResult {
  const { N, kernel, geometry, potential } = options
  if (!Number.isInteger(N) || N < 2) throw new EngineInputError(`a ground state needs an integer N ≥ 2 (got ${N})`)
  const d = coordinateDimension(kernel, geometry)
  if (geometry.kind === 'free' && potential === undefined) throw new EngineInputError('free space needs a confining external potential V')
  if (geometry.kind !== 'free' && potential !== undefined) throw new EngineInputError(`the ${geometry.kind} carries no external potential; leave it out`)
  if (potential !== undefined && potential.d !== d) throw new EngineInputError(`the potential takes points of dimension ${potential.d} but the geometry has dimension ${d}`)
  const restarts = options.restarts ?? 10
  if (!Number.isInteger(restarts) || restarts < 0) throw new EngineInputError(`restarts must be an integer ≥ 0 (got ${restarts})`)
  const starts = options.starts ?? []
  starts.forEach((s, k) => {
    if (s.length !== N * d) throw new EngineInputError(`start ${k} has ${s.length} coordinates, not N·d = ${N * d}`, { configuration: k })
  })
  const total = starts.length + restarts
  if (total < 1) throw new EngineInputError('give at least one start (restarts ≥ 1 or a starting configuration)')
  const rk = radialKernel(kernel, d)
  const tolerance = options.ewaldTolerance ?? 1e-12
  const lattice = geometry.kind === 'torus' ? torusLattice(geometry) : undefined
  const L = geometry.kind === 'torus' ? geometry.L : 1
  const u = new Float64Array(N * d)
  const gu = new Float64Array(N * d)

  const objective = (y: Float64Array, grad: Float64Array): number => {
    if (lattice !== undefined) {
      try {
        const r = torusEnergyAndGradient(lattice, y, { tolerance })
        grad.set(r.gradient)
        return r.value
      }
      catch {
        return NaN
      }
    }
    if (geometry.kind === 'sphere') {
      for (let i = 0; i < N; i++) {
        const r = Math.hypot(y[3 * i], y[3 * i + 1], y[3 * i + 2])
        if (r === 0) return NaN
        for (let k = 0; k < 3; k++) u[3 * i + k] = y[3 * i + k] / r
      }
      const value = energyAndGradient(u, N, 3, rk, undefined, gu)
      for (let i = 0; i < N; i++) {
        const r = Math.hypot(y[3 * i], y[3 * i + 1], y[3 * i + 2])
        let radial = 0
        for (let k = 0; k < 3; k++) radial += gu[3 * i + k] * u[3 * i + k]
        for (let k = 0; k < 3; k++) grad[3 * i + k] = (gu[3 * i + k] - radial * u[3 * i + k]) / r
      }
      return value
    }
    return energyAndGradient(y, N, d, rk, potential, grad)
  }

  const finalPoints = (x: Float64Array): Float64Array => {
    if (geometry.kind === 'sphere') return projectToSphere(x, N)
    if (geometry.kind === 'torus') return x.map(v => v - geometry.L * Math.floor(v / geometry.L))
    return Float64Array.from(x)
  }
  const canonicalEnergy = (pts: Float64Array): { H: number, pairSum: number } => {
    if (lattice !== undefined) {
      const H = torusEnergy(lattice, pts, { tolerance }).value
      return { H, pairSum: H / 2 }
    }
    const e = energy({ N, d, points: pts }, { kernel, geometry, potential })
    return { H: e.H, pairSum: e.pairSum }
  }

  const runs: GroundStateRun[] = []
  let best: { points: Float64Array, H: number, pairSum: number } | undefined
  for (let k = 0; k < total; k++) {
    const start = k < starts.length ? Float64Array.from(starts[k]) : randomStart(geometry, N, d, rng)
    const result = lbfgs(objective, start, { maxStepLength: geometry.kind === 'torus' ? 0.25 * L : 0.5, ...options.lbfgs })
    const pts = finalPoints(result.x)
    const e = canonicalEnergy(pts)
    runs.push({ energy: e.H, iterations: result.iterations, gradientNorm: result.gradientNorm, converged: result.converged })
    if (best === undefined || e.H < best.H) best = { points: pts, H: e.H, pairSum: e.pairSum }
    options.onProgress?.(k + 1, total)
  }
  const tol = options.distinctTolerance ?? 1e-9
  const sorted = runs.map(r => r.energy).sort((a, b) => a - b)
  const distinct: Array<{ energy: number, count: number }> = []
  for (const E of sorted) {
    const last = distinct[distinct.length - 1]
    if (last !== undefined && Math.abs(E - last.energy) <= tol * Math.max(1, Math.abs(E))) last.count++
    else distinct.push({ energy: E, count: 1 })
  }
  const chosen = best as { points: Float64Array, H: number, pairSum: number }
  return {
    best: { N, d, points: chosen.points },
    energy: chosen.H,
    pairSum: chosen.pairSum,
    convention: CANONICAL_CONVENTION,
    runs,
    spread: { min: sorted[0], max: sorted[sorted.length - 1], distinct },
    parametrisation: geometry.kind === 'sphere' ? 'sphere-projected' : geometry.kind === 'torus' ? 'torus-wrapped' : 'cartesian',
    engineVersion: ENGINE_VERSION,
  }
}
