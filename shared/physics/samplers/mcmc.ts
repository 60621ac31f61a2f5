// Markov chain Monte Carlo for the canonical Gibbs measure P ∝ e^{−(β/2) H}, H = Σ_{i≠j} g(x_i − x_j)
// + N Σ V(x_i) (the convention of this engine), for any β > 0, kernel, potential and geometry.
// One sweep updates the points one after the other (a Metropolis-within-Gibbs scan); the energy change of
// moving point i, ΔH = 2 Σ_{j≠i} [g(y − x_j) − g(x_i − x_j)] + N [V(y) − V(x_i)], costs O(N).
// - Metropolis (Metropolis, Rosenbluth, Rosenbluth, Teller & Teller, J. Chem. Phys. 21, 1953):
//   y = x_i + h ξ (free space), y = (x_i + h ξ)/|x_i + h ξ| with ξ ∈ R³ (sphere; the proposal density
//   depends on x_i·y only, hence is symmetric), y = x_i + h ξ mod L (torus); accept with min(1, e^{−βΔH/2}).
// - MALA (Roberts & Tweedie, "Exponential convergence of Langevin distributions and their discrete
//   approximations", Bernoulli 2, 1996): with τ = h²/2 and ∇ log π = −(β/2)∇_i H,
//   y = x_i + τ ∇ log π(x_i) + h ξ, accepted with min(1, π(y) q(x_i|y) / (π(x_i) q(y|x_i))),
//   q(y|x) ∝ e^{−|y − x − τ∇log π(x)|²/(2h²)}. On the sphere the drift and the noise live in the tangent
//   plane at x_i and the proposal is carried to S² by the central (gnomonic) projection y = (x + v)/|x + v|,
//   whose inverse is v = y/(x·y) − x and whose area factor is (1 + |v|²)^{3/2}, so q(y|x) is known exactly
//   and the chain stays reversible. MALA on the torus is not provided (use Metropolis).
// - Step size: adapted during burn-in only, after every sweep, log h += (a − a*)/√(k + 1) with a the
//   sweep's acceptance rate (a Robbins–Monro recursion; Andrieu & Thoms, Stat. Comput. 18, 2008), target
//   a* = 0.44 for one-point Metropolis moves (Gelman, Roberts & Gilks, Bayesian Statistics 5, 1996) and 0.574
//   for MALA (Roberts & Rosenthal, Stat. Sci. 16, 2001); fixed afterwards.
// - Integrated autocorrelation time τ_int = 1 + 2 Σ_{t=1}^{M} ρ(t) with Sokal's adaptive window (the
//   smallest M with M ≥ c τ_int(M), c = 5) and the effective sample size n/τ_int (Sokal, "Monte Carlo
//   methods in statistical mechanics: foundations and new algorithms", in Functional Integration, 1997).
// - The state (points, generator state, iteration, step size, counters, energy trace) is plain JSON;
//   resuming from it continues the same chain number for number.
import type { Configuration, Geometry, Kernel } from '../types'
import type { Potential } from '../potentials/types'
import type { Rng, RngState } from '../random'
import { rngFromState } from '../random'
import { EngineInputError } from '../errors'
import { CANONICAL_CONVENTION } from '../conventions'
import type { EnergyConvention } from '../conventions'
import { ENGINE_VERSION } from '../version'
import { energy } from '../energy'
import { periodicGreenFunction, torusEnergy } from '../torus/ewald'
import type { Lattice } from '../torus/lattice'
import { CompensatedSum } from '../summation'
import { coordinateDimension, particleGradient, radialKernel, torusLattice } from './forces'
import type { RadialKernel } from './forces'

export type McmcMethod = 'metropolis' | 'mala'

export interface McmcModel {
  readonly kernel: Kernel
  readonly geometry: Geometry
  /** The external potential (required in free space, absent on the sphere and the torus). */
  readonly potential?: Potential
  readonly beta: number
}

export interface McmcOptions {
  readonly model: McmcModel
  readonly N: number
  readonly method?: McmcMethod
  /** Sweeps after burn-in (each sweep proposes one move per point). */
  readonly sweeps: number
  /** Sweeps of burn-in (step-size adaptation, nothing recorded). Default 0. */
  readonly burnIn?: number
  /** Keep one configuration every `thin` sweeps after burn-in (0: keep none). Default 1. */
  readonly thin?: number
  /** The initial step size h (default 0.3 times the typical spacing). */
  readonly stepSize?: number
  /** Adapt the step size during burn-in (default true). */
  readonly adapt?: boolean
  /** Starting points (flat); default: drawn from the generator. */
  readonly initial?: Float64Array
  /** Stop (with a resumable state) once this many sweeps in total (burn-in included) are done. */
  readonly stopAtIteration?: number
  /** Called after every sweep with (sweeps done, sweeps in total). */
  readonly onProgress?: (done: number, total: number) => void
  /** Ewald tolerance on the torus (default 1e−12). */
  readonly ewaldTolerance?: number
}

/** Everything needed to continue a chain exactly (JSON-safe). */
export interface McmcState {
  readonly N: number
  readonly d: number
  readonly method: McmcMethod
  readonly points: number[]
  readonly rng: RngState
  /** Sweeps done so far, burn-in included. */
  readonly iteration: number
  readonly stepSize: number
  /** Accepted and proposed moves after burn-in. */
  readonly accepted: number
  readonly proposed: number
  /** Canonical energy H after every sweep past burn-in. */
  readonly trace: number[]
}

export interface Autocorrelation {
  /** Integrated autocorrelation time τ_int (in sweeps). */
  readonly tau: number
  /** Sokal's window M. */
  readonly window: number
  /** n / τ_int. */
  readonly effectiveSampleSize: number
  readonly mean: number
  readonly variance: number
  /** √(variance · τ_int / n): the standard error of the mean. */
  readonly standardError: number
}

export interface McmcResult {
  readonly method: McmcMethod
  readonly beta: number
  /** Configurations kept in this run (after burn-in, every `thin` sweeps). */
  readonly configurations: Configuration[]
  /** The iteration (sweep index, burn-in included, 1-based) at which each kept configuration was taken. */
  readonly keptAt: number[]
  /** H after every sweep past burn-in, from the start of the chain. */
  readonly trace: Float64Array
  /** Acceptance rate after burn-in. */
  readonly acceptanceRate: number
  readonly stepSize: number
  readonly autocorrelation: Autocorrelation | undefined
  /** True when the run stopped before the last sweep (stopAtIteration). */
  readonly stopped: boolean
  readonly state: McmcState
  readonly convention: EnergyConvention
  readonly engineVersion: string
}

/** τ_int, Sokal's window and the effective sample size of a trace (c = 5 by default). */
export function integratedAutocorrelation(trace: ArrayLike<number>, c = 5): Autocorrelation {
  const n = trace.length
  if (n < 2) throw new EngineInputError(`the autocorrelation needs at least 2 values (got ${n})`)
  const m = new CompensatedSum()
  for (let t = 0; t < n; t++) m.add(trace[t])
  const mean = m.value / n
  const dev = new Float64Array(n)
  for (let t = 0; t < n; t++) dev[t] = trace[t] - mean
  const cov = (lag: number): number => {
    const s = new CompensatedSum()
    for (let t = 0; t + lag < n; t++) s.add(dev[t] * dev[t + lag])
    return s.value / n
  }
  const c0 = cov(0)
  if (c0 === 0) return { tau: 1, window: 0, effectiveSampleSize: n, mean, variance: 0, standardError: 0 }
  let tau = 1
  let M = 0
  for (let lag = 1; lag < n; lag++) {
    tau += (2 * cov(lag)) / c0
    M = lag
    if (lag >= c * tau) break
  }
  const variance = (c0 * n) / (n - 1)
  return { tau, window: M, effectiveSampleSize: n / tau, mean, variance, standardError: Math.sqrt((variance * Math.max(tau, 0)) / n) }
}

/** V at a point, NaN where V is undefined (a parsed expression throws there; a proposal there is rejected). */
function potentialAt(potential: Potential, points: ArrayLike<number>, offset: number): number {
  try {
    return potential.value(points, offset)
  }
  catch {
    return NaN
  }
}

function checkModel(model: McmcModel, N: number): { d: number, kernel: RadialKernel, lattice?: Lattice } {
  if (!Number.isInteger(N) || N < 1) throw new EngineInputError(`the number of points N must be an integer ≥ 1 (got ${N})`)
  if (!(model.beta > 0) || !Number.isFinite(model.beta)) throw new EngineInputError(`β must be a finite number > 0 (got ${model.beta})`)
  const d = coordinateDimension(model.kernel, model.geometry)
  if (model.geometry.kind === 'free' && model.potential === undefined) throw new EngineInputError('free space needs a confining external potential V')
  if (model.geometry.kind !== 'free' && model.potential !== undefined) throw new EngineInputError(`the ${model.geometry.kind} carries no external potential; leave it out`)
  if (model.potential !== undefined && model.potential.d !== d) throw new EngineInputError(`the potential takes points of dimension ${model.potential.d} but the geometry has dimension ${d}`)
  const kernel = radialKernel(model.kernel, d)
  return { d, kernel, lattice: model.geometry.kind === 'torus' ? torusLattice(model.geometry) : undefined }
}

function initialPoints(model: McmcModel, N: number, d: number, rng: Rng): Float64Array {
  const p = new Float64Array(N * d)
  const g = model.geometry
  if (g.kind === 'torus') {
    for (let k = 0; k < p.length; k++) p[k] = rng.uniform() * g.L
    return p
  }
  for (let k = 0; k < p.length; k++) p[k] = 0.5 * rng.normal()
  if (g.kind === 'sphere') {
    for (let i = 0; i < N; i++) {
      const r = Math.hypot(p[3 * i], p[3 * i + 1], p[3 * i + 2])
      for (let k = 0; k < 3; k++) p[3 * i + k] /= r
    }
  }
  return p
}

function defaultStep(model: McmcModel, N: number, d: number): number {
  const g = model.geometry
  if (g.kind === 'torus') return 0.3 * g.L * Math.pow(N, -1 / d)
  if (g.kind === 'sphere') return 0.3 * Math.sqrt(4 / N)
  return 0.3 * Math.pow(N, -1 / d)
}

/** Runs (or continues, with `resume`) a chain. Without `resume` the generator `rng` is used and advanced. */
export function runMcmc(options: McmcOptions, start: { rng: Rng } | { resume: McmcState }): McmcResult {
  const { model, N } = options
  const method: McmcMethod = options.method ?? 'metropolis'
  if (method !== 'metropolis' && method !== 'mala') throw new EngineInputError(`the MCMC method must be metropolis or mala (got ${String(method)})`)
  const { d, kernel, lattice } = checkModel(model, N)
  const geometry = model.geometry
  if (method === 'mala' && geometry.kind === 'torus') throw new EngineInputError('MALA is not available on the torus (it needs Ewald forces); use metropolis')
  const burnIn = options.burnIn ?? 0
  const sweeps = options.sweeps
  const thin = options.thin ?? 1
  if (!Number.isInteger(burnIn) || burnIn < 0) throw new EngineInputError(`burn-in must be an integer ≥ 0 (got ${burnIn})`)
  if (!Number.isInteger(sweeps) || sweeps < 0) throw new EngineInputError(`sweeps must be an integer ≥ 0 (got ${sweeps})`)
  if (!Number.isInteger(thin) || thin < 0) throw new EngineInputError(`thin must be an integer ≥ 0 (got ${thin})`)
  const total = burnIn + sweeps
  const stopAt = Math.min(total, options.stopAtIteration ?? total)
  const beta = model.beta
  const tolerance = options.ewaldTolerance ?? 1e-12
  // the torus Green function, its Ewald setup built once for every move
  const green = lattice !== undefined ? periodicGreenFunction(lattice, { tolerance }) : undefined
  const potential = model.potential
  const L = geometry.kind === 'torus' ? geometry.L : 0

  let rng: Rng
  let points: Float64Array
  let iteration: number
  let step: number
  let accepted: number
  let proposed: number
  const trace: number[] = []
  if ('resume' in start) {
    const s = start.resume
    if (s.N !== N || s.d !== d) throw new EngineInputError(`the saved state has N = ${s.N}, d = ${s.d}; this run needs N = ${N}, d = ${d}`)
    if (s.method !== method) throw new EngineInputError(`the saved state comes from ${s.method}, not ${method}`)
    if (!Array.isArray(s.points) || s.points.length !== N * d) throw new EngineInputError(`the saved state needs ${N * d} coordinates (got ${Array.isArray(s.points) ? s.points.length : 'none'})`)
    if (!Number.isInteger(s.iteration) || s.iteration < 0 || s.iteration > total) throw new EngineInputError(`the saved iteration ${s.iteration} is outside 0 … ${total}`)
    if (!(s.stepSize > 0)) throw new EngineInputError(`the saved step size must be > 0 (got ${s.stepSize})`)
    if (!Number.isInteger(s.accepted) || !Number.isInteger(s.proposed) || s.accepted < 0 || s.proposed < s.accepted) throw new EngineInputError('the saved state has inconsistent accepted/proposed counts')
    if (!Array.isArray(s.trace) || s.trace.length !== Math.max(0, s.iteration - burnIn) || !s.trace.every(v => typeof v === 'number')) {
      throw new EngineInputError(`the saved energy trace must hold one number per sweep after burn-in (${Math.max(0, s.iteration - burnIn)} expected)`)
    }
    s.points.forEach((v, k) => {
      if (typeof v !== 'number' || !Number.isFinite(v)) throw new EngineInputError(`the saved point ${Math.floor(k / d)} has a coordinate that is not a finite number`, { index: Math.floor(k / d) })
    })
    rng = rngFromState(s.rng)
    points = Float64Array.from(s.points)
    iteration = s.iteration
    step = s.stepSize
    accepted = s.accepted
    proposed = s.proposed
    trace.push(...s.trace)
  }
  else {
    rng = start.rng
    if (options.initial !== undefined) {
      if (options.initial.length !== N * d) throw new EngineInputError(`the initial points need ${N * d} coordinates (got ${options.initial.length})`)
      points = Float64Array.from(options.initial)
      for (let k = 0; k < points.length; k++) {
        if (!Number.isFinite(points[k])) throw new EngineInputError(`initial point ${Math.floor(k / d)} has a coordinate that is not finite`, { index: Math.floor(k / d) })
      }
    }
    else {
      points = initialPoints(model, N, d, rng)
    }
    if (geometry.kind === 'torus') for (let k = 0; k < points.length; k++) points[k] -= L * Math.floor(points[k] / L)
    if (geometry.kind === 'sphere') {
      for (let i = 0; i < N; i++) {
        const r = Math.hypot(points[3 * i], points[3 * i + 1], points[3 * i + 2])
        if (!(r > 0)) throw new EngineInputError(`initial point ${i} is at the origin and cannot be put on the sphere`, { index: i })
        for (let k = 0; k < 3; k++) points[3 * i + k] /= r
      }
    }
    if (potential !== undefined) {
      for (let i = 0; i < N; i++) {
        const value = potentialAt(potential, points, i * d)
        if (!Number.isFinite(value)) throw new EngineInputError(`the potential is not finite at starting point ${i} (V = ${value}); give starting points inside the domain of V`, { index: i })
      }
    }
    iteration = 0
    step = options.stepSize ?? defaultStep(model, N, d)
    if (!(step > 0) || !Number.isFinite(step)) throw new EngineInputError(`the step size must be a finite number > 0 (got ${step})`)
    accepted = 0
    proposed = 0
  }

  const y = new Float64Array(d)
  const xi = new Float64Array(d)
  const v = new Float64Array(d)
  const gx = new Float64Array(d)
  const gy = new Float64Array(d)
  const scratch = new Float64Array(d)
  const diff = new Float64Array(d)
  const target = method === 'mala' ? 0.574 : 0.44
  const adapt = options.adapt ?? true

  /** ΔH for moving point i to y; NaN when the move is impossible. */
  const deltaH = (i: number): number => {
    const acc = new CompensatedSum()
    if (green !== undefined) {
      for (let j = 0; j < N; j++) {
        if (j === i) continue
        let same = true
        for (let k = 0; k < d; k++) {
          diff[k] = y[k] - points[j * d + k]
          const w = diff[k] / L
          if (Math.abs(w - Math.round(w)) > 0) same = false
        }
        if (same) return NaN
        const gNew = green(diff)
        for (let k = 0; k < d; k++) diff[k] = points[i * d + k] - points[j * d + k]
        acc.add(2 * (gNew - green(diff)))
      }
      return acc.value
    }
    for (let j = 0; j < N; j++) {
      if (j === i) continue
      let uNew = 0
      let uOld = 0
      for (let k = 0; k < d; k++) {
        const a = y[k] - points[j * d + k]
        const b = points[i * d + k] - points[j * d + k]
        uNew += a * a
        uOld += b * b
      }
      if (uNew === 0) return NaN
      acc.add(2 * (kernel.value(uNew) - kernel.value(uOld)))
    }
    if (potential !== undefined) {
      const vNew = potentialAt(potential, y, 0)
      if (!Number.isFinite(vNew)) return NaN
      acc.add(N * (vNew - potential.value(points, i * d)))
    }
    return acc.value
  }

  /** log q(to | from) for MALA up to a constant; `grad` = ∇_i H at `from`. Sphere: gnomonic chart at `from`. */
  const logProposal = (from: ArrayLike<number>, fo: number, to: ArrayLike<number>, to0: number, grad: Float64Array): number => {
    const tau = (step * step) / 2
    const c = -(beta / 2) * tau
    if (geometry.kind === 'sphere') {
      let dot = 0
      let gdot = 0
      for (let k = 0; k < 3; k++) {
        dot += from[fo + k] * to[to0 + k]
        gdot += grad[k] * from[fo + k]
      }
      if (!(dot > 0)) return -Infinity
      let r2 = 0
      let vv = 0
      for (let k = 0; k < 3; k++) {
        const vk = to[to0 + k] / dot - from[fo + k]
        const drift = c * (grad[k] - gdot * from[fo + k])
        const e = vk - drift
        r2 += e * e
        vv += vk * vk
      }
      return -r2 / (2 * step * step) + 1.5 * Math.log1p(vv)
    }
    let r2 = 0
    for (let k = 0; k < d; k++) {
      const e = to[to0 + k] - from[fo + k] - c * grad[k]
      r2 += e * e
    }
    return -r2 / (2 * step * step)
  }

  const configurations: Configuration[] = []
  const keptAt: number[] = []
  const fullEnergy = (): number => {
    if (lattice !== undefined) return torusEnergy(lattice, points, { tolerance }).value
    return energy({ N, d, points }, { kernel: model.kernel, geometry, potential }).H
  }

  while (iteration < stopAt) {
    let sweepAccepted = 0
    for (let i = 0; i < N; i++) {
      let logAlpha: number
      const o = i * d
      if (method === 'metropolis') {
        for (let k = 0; k < d; k++) y[k] = points[o + k] + step * rng.normal()
        if (geometry.kind === 'sphere') {
          const r = Math.hypot(y[0], y[1], y[2])
          for (let k = 0; k < 3; k++) y[k] /= r
        }
        else if (geometry.kind === 'torus') {
          for (let k = 0; k < d; k++) y[k] -= L * Math.floor(y[k] / L)
        }
        const dH = deltaH(i)
        logAlpha = Number.isNaN(dH) ? -Infinity : -(beta / 2) * dH
      }
      else {
        const tau = (step * step) / 2
        if (!particleGradient(points, N, d, i, points, o, kernel, potential, gx, scratch)) throw new EngineInputError(`the force on point ${i} is not finite`, { index: i })
        for (let k = 0; k < d; k++) xi[k] = rng.normal()
        if (geometry.kind === 'sphere') {
          let gdot = 0
          let xdot = 0
          for (let k = 0; k < 3; k++) {
            gdot += gx[k] * points[o + k]
            xdot += xi[k] * points[o + k]
          }
          for (let k = 0; k < 3; k++) v[k] = -(beta / 2) * tau * (gx[k] - gdot * points[o + k]) + step * (xi[k] - xdot * points[o + k])
          for (let k = 0; k < 3; k++) y[k] = points[o + k] + v[k]
          const r = Math.hypot(y[0], y[1], y[2])
          for (let k = 0; k < 3; k++) y[k] /= r
        }
        else {
          for (let k = 0; k < d; k++) y[k] = points[o + k] - (beta / 2) * tau * gx[k] + step * xi[k]
        }
        const dH = deltaH(i)
        if (Number.isNaN(dH) || !particleGradient(points, N, d, i, y, 0, kernel, potential, gy, scratch)) {
          logAlpha = -Infinity
        }
        else {
          logAlpha = -(beta / 2) * dH + logProposal(y, 0, points, o, gy) - logProposal(points, o, y, 0, gx)
        }
      }
      const u = rng.uniformPositive()
      if (Math.log(u) < logAlpha) {
        for (let k = 0; k < d; k++) points[o + k] = y[k]
        sweepAccepted++
      }
    }
    iteration++
    if (iteration <= burnIn) {
      if (adapt) step *= Math.exp((sweepAccepted / N - target) / Math.sqrt(iteration))
    }
    else {
      accepted += sweepAccepted
      proposed += N
      trace.push(fullEnergy())
      if (thin > 0 && (iteration - burnIn) % thin === 0) {
        configurations.push({ N, d, points: Float64Array.from(points) })
        keptAt.push(iteration)
      }
    }
    options.onProgress?.(iteration, total)
  }

  const state: McmcState = {
    N,
    d,
    method,
    points: Array.from(points),
    rng: rng.state(),
    iteration,
    stepSize: step,
    accepted,
    proposed,
    trace: trace.slice(),
  }
  return {
    method,
    beta,
    configurations,
    keptAt,
    trace: Float64Array.from(trace),
    acceptanceRate: proposed > 0 ? accepted / proposed : 0,
    stepSize: step,
    autocorrelation: trace.length >= 2 ? integratedAutocorrelation(trace) : undefined,
    stopped: iteration < total,
    state,
    convention: CANONICAL_CONVENTION,
    engineVersion: ENGINE_VERSION,
  }
}
