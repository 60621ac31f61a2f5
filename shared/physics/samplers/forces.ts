// Gradients of the canonical energy H = Σ_{i≠j} g(x_i − x_j) + N Σ_i V(x_i) (the convention of this engine):
//   ∇_{x_i} H = 2 Σ_{j≠i} ∇g(x_i − x_j) + N ∇V(x_i),
// with ∇g(x) = φ(|x|²)·x for the radial kernels: φ(u) = −1/u for g = −log|x|, φ(u) = −s u^{−s/2−1} for
// g = |x|^{−s} (and s = d − 2 for the Coulomb kernel) — elementary calculus. On the sphere the points
// are kept in R³ and the chordal distance is used; the tangential part of the gradient is
// (I − x xᵀ)∇H (the derivative along the sphere; e.g. Absil, Mahony & Sepulchre, Optimization
// Algorithms on Matrix Manifolds, 2008, §3.6). On the torus the gradient of H_T comes in closed form from
// the Ewald sum (torus/ewald.ts, torusEnergyAndGradient: ψ_α′ in real space, the derivative of the
// structure factors or of the mesh splines in reciprocal space).
import type { Geometry, Kernel } from '../types'
import type { Potential } from '../potentials/types'
import { EngineInputError } from '../errors'
import { assertKernel } from '../kernels'
import { cubicLattice } from '../torus/lattice'
import type { Lattice } from '../torus/lattice'

/** g(u) and φ(u) (with ∇g(x) = φ(|x|²) x) of a kernel, as functions of the squared distance u. */
export interface RadialKernel {
  value(u: number): number
  factor(u: number): number
}

/** The kernel as a function of the squared distance, with its gradient factor. */
export function radialKernel(kernel: Kernel, d: number): RadialKernel {
  if (kernel.name === 'log') return { value: u => -0.5 * Math.log(u), factor: u => -1 / u }
  const s = kernel.name === 'coulomb' ? d - 2 : kernel.s
  if (!(s > 0) || !Number.isFinite(s)) throw new EngineInputError(`the kernel exponent s must be a finite number > 0 (got ${s})`)
  if (s === 1) return { value: u => 1 / Math.sqrt(u), factor: u => -1 / (u * Math.sqrt(u)) }
  if (s === 2) return { value: u => 1 / u, factor: u => -2 / (u * u) }
  const half = -s / 2
  return { value: u => Math.pow(u, half), factor: u => -s * Math.pow(u, half - 1) }
}

/** The dimension of the stored coordinates (3 on the sphere) after checking the kernel. */
export function coordinateDimension(kernel: Kernel, geometry: Geometry): number {
  if (geometry.kind === 'sphere') {
    if (kernel.name === 'riesz' && !(kernel.s > 0 && Number.isFinite(kernel.s))) throw new EngineInputError(`the riesz exponent s must be a finite number > 0 (got ${kernel.s})`)
    return 3
  }
  try {
    assertKernel(kernel, geometry.d)
  }
  catch (e) {
    throw new EngineInputError(e instanceof Error ? e.message : String(e))
  }
  if (geometry.kind === 'torus') {
    const ok = (geometry.d === 2 && kernel.name === 'log') || (geometry.d === 3 && (kernel.name === 'coulomb' || (kernel.name === 'riesz' && kernel.s === 1)))
    if (!ok) throw new EngineInputError(`on the torus only the Coulomb kernels are available (log in d = 2, coulomb in d = 3), through Ewald sums; got ${kernel.name} in d = ${geometry.d}`)
    if (!(geometry.L > 0) || !Number.isFinite(geometry.L)) throw new EngineInputError(`the torus side L must be a finite number > 0 (got ${geometry.L})`)
  }
  return geometry.d
}

/** ∇_{x_i} H for free space or the sphere (not projected), the point i taken at `at[atOffset …]`
 *  instead of its stored position; written into out[0 … d − 1]. Returns false at a coincidence. */
export function particleGradient(
  points: Float64Array, N: number, d: number, i: number, at: ArrayLike<number>, atOffset: number,
  kernel: RadialKernel, potential: Potential | undefined, out: Float64Array, scratch: Float64Array,
): boolean {
  for (let k = 0; k < d; k++) out[k] = 0
  for (let j = 0; j < N; j++) {
    if (j === i) continue
    let u = 0
    for (let k = 0; k < d; k++) {
      const dx = at[atOffset + k] - points[j * d + k]
      u += dx * dx
    }
    if (u === 0) return false
    const f = 2 * kernel.factor(u)
    for (let k = 0; k < d; k++) out[k] += f * (at[atOffset + k] - points[j * d + k])
  }
  if (potential !== undefined) {
    try {
      potential.gradient(at, atOffset, scratch)
    }
    catch {
      return false // outside the domain of V
    }
    for (let k = 0; k < d; k++) out[k] += N * scratch[k]
  }
  for (let k = 0; k < d; k++) if (!Number.isFinite(out[k])) return false
  return true
}

/** H and ∇H (all points) in free space or on the sphere (points in R³, gradient not projected).
 *  Returns NaN at a coincidence or where V is not finite or not defined. */
export function energyAndGradient(points: Float64Array, N: number, d: number, kernel: RadialKernel, potential: Potential | undefined, grad: Float64Array): number {
  grad.fill(0)
  let pairs = 0
  let field = 0
  for (let i = 0; i < N; i++) {
    for (let j = i + 1; j < N; j++) {
      let u = 0
      for (let k = 0; k < d; k++) {
        const dx = points[i * d + k] - points[j * d + k]
        u += dx * dx
      }
      if (u === 0) return NaN
      pairs += kernel.value(u)
      const f = 2 * kernel.factor(u)
      for (let k = 0; k < d; k++) {
        const g = f * (points[i * d + k] - points[j * d + k])
        grad[i * d + k] += g
        grad[j * d + k] -= g
      }
    }
  }
  if (potential !== undefined) {
    const tmp = new Float64Array(d)
    for (let i = 0; i < N; i++) {
      let v: number
      try {
        v = potential.value(points, i * d)
        potential.gradient(points, i * d, tmp)
      }
      catch {
        return NaN // outside the domain of V
      }
      if (!Number.isFinite(v)) return NaN
      field += v
      for (let k = 0; k < d; k++) grad[i * d + k] += N * tmp[k]
    }
  }
  return 2 * pairs + N * field
}

/** The torus [0, L)^d as an Ewald lattice. */
export function torusLattice(geometry: Geometry): Lattice {
  if (geometry.kind !== 'torus' || (geometry.d !== 2 && geometry.d !== 3)) throw new EngineInputError('torus energies need a torus of dimension 2 or 3')
  return cubicLattice(geometry.d, geometry.L)
}
