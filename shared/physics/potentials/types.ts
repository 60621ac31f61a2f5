// External potentials V : R^d → R. The contract every preset and every parsed
// expression satisfies; energies, equilibrium measures and samplers only use this.

/** Presets the engine knows in closed form. Parameters are the user's, unscaled. */
export type PotentialPreset
  = | { name: 'quadratic', a: number } // V(x) = a|x|²
    | { name: 'quartic', a: number, b: number } // V(x) = a|x|² + b|x|⁴
    | { name: 'double-well', a: number, b: number } // V(x) = b|x|⁴ − a|x|² (a, b > 0)
    | { name: 'radial-power', a: number, p: number } // V(x) = a|x|^p (p > 0)

export interface Potential {
  /** Dimension of the points this potential takes. */
  readonly d: number
  /** Canonical source text (what is stored), e.g. `a*r^2` with parameters bound. */
  readonly text: string
  /** LaTeX for display. */
  readonly latex: string
  /** Set when the potential is one of the presets (lets closed forms apply). */
  readonly preset?: PotentialPreset
  /** True when V depends on |x| only. */
  readonly radial: boolean
  /** V at the point stored at points[offset … offset + d − 1]. */
  value(points: ArrayLike<number>, offset?: number): number
  /** ∇V at that point, written into out[0 … d − 1]. */
  gradient(points: ArrayLike<number>, offset: number, out: Float64Array): void
  /** ΔV at that point. */
  laplacian(points: ArrayLike<number>, offset?: number): number
  /** For radial potentials: V as a function of r = |x| (and its derivatives). */
  radialProfile?: {
    v(r: number): number
    dv(r: number): number
    d2v(r: number): number
  }
}
