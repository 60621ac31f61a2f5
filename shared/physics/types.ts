// Core types of the engine: geometries, kernels, configurations.

/** Free space R^d with an external potential, the periodic box [0, L)^d with a
 *  uniform neutralising background, or the unit sphere S² ⊂ R³ (chordal distances). */
export type Geometry
  = | { kind: 'free', d: 1 | 2 | 3 }
    | { kind: 'torus', d: 1 | 2 | 3, L: number }
    | { kind: 'sphere' } // points stored in R³ (d = 3 coordinates), |x| = 1

/** g(x) = −log|x| ("log"), |x|^(2−d) ("coulomb", d ≥ 3), |x|^(−s) ("riesz"). */
export type Kernel
  = | { name: 'log' }
    | { name: 'coulomb' }
    | { name: 'riesz', s: number }

/** One configuration: N points of dimension d, stored flat (x0, y0, x1, y1, …). */
export interface Configuration {
  readonly N: number
  readonly d: number
  readonly points: Float64Array
}
