// The equilibrium measure μ_V of a kernel and a potential, and the quantities built from it
// (Saff & Totik, Logarithmic Potentials with External Fields, 1997, ch. I, with their Q = V/2):
// h^μ(x) = ∫ g(x−y) dμ(y), I_V, c_V = ∬ g dμ dμ + ½∫V dμ, ζ = h^μ + V/2 − c_V.
import type { Kernel } from '../types'

export type Support
  = | { kind: 'ball', center: number[], radius: number } // interval [−R, R] in d = 1, disk in 2, ball in 3
    | { kind: 'annulus', inner: number, outer: number } // d = 2 radial potentials
    | { kind: 'intervals', intervals: Array<[number, number]> } // d = 1, possibly several
    | { kind: 'whole' } // sphere or torus: the uniform measure

export interface EquilibriumMeasure {
  readonly d: number
  readonly kernel: Kernel
  readonly support: Support
  /** 'closed-form' or 'numerical' (with the achieved accuracy in `accuracy`). */
  readonly method: 'closed-form' | 'numerical'
  /** Estimated absolute accuracy of IV, cV and the potential (0 for closed forms up to rounding). */
  readonly accuracy: number
  /** Published source of the formula or the method. */
  readonly source: string
  /** ∬ g(x−y) dμ(x) dμ(y). */
  readonly selfEnergy: number
  /** I_V(μ_V) = ∬ g dμ dμ + ∫ V dμ. */
  readonly IV: number
  /** c_V = ∬ g dμ dμ + ½ ∫ V dμ (the Euler–Lagrange constant). */
  readonly cV: number
  /** Density of μ_V at a point (0 outside the support). */
  density(points: ArrayLike<number>, offset?: number): number
  /** h^μ(x) = ∫ g(x−y) dμ(y). */
  potential(points: ArrayLike<number>, offset?: number): number
  /** ⟨h^μ⟩ over the sphere ∂B(x, η) (the circle in d = 2; the two points x ± η in d = 1). */
  sphereAverage(points: ArrayLike<number>, offset: number, eta: number): number
  /** ζ(x) = h^μ(x) + V(x)/2 − c_V ≥ 0, zero on the support. */
  zeta(points: ArrayLike<number>, offset?: number): number
}
