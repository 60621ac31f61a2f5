// Equilibrium measure of the 2-D log kernel g(x) = −log|x| for a radial potential V(x) = f(|x|).
// With m(r) = r f'(r) non-decreasing, μ_V = ΔV/(4π) dx on the annulus {r₀ ≤ |x| ≤ R} (a disk when r₀ = 0),
// where r₀ f'(r₀) = 0 (r₀ = 0 if f' > 0 everywhere) and R f'(R) = 2
// (Saff & Totik, Logarithmic Potentials with External Fields, 1997, Thm IV.6.1, with their Q = V/2:
// the mass inside radius r is (r f'(r) − r₀ f'(r₀))/2; for V = a r² this gives radius 1/√a and density a/π).
// Potential by Newton's theorem (a circle of mass m at radius ρ contributes −m log max(|x|, ρ)), integrated by
// parts against the mass function M(s) = s f'(s)/2:
//   h^μ(x) = −log R + (f(R) − f(max(|x|, r₀)))/2 for |x| ≤ R,   h^μ(x) = −log|x| for |x| ≥ R,
// so c_V = f(R)/2 − log R, ∫V dμ = f(R) − ½∫_{r₀}^{R} s f'(s)² ds (checked against ∫ f ΔV/(4π) by quadrature),
// ∬ g dμ dμ = c_V − ½∫V dμ and I_V = c_V + ½∫V dμ.
import type { Potential } from '../potentials/types'
import { EngineInputError } from '../errors'
import { ENGINE_VERSION } from '../version'
import { integrateAdaptive } from '../quadrature'
import type { EquilibriumMeasure } from './types'

export interface RadialPlaneMeasure extends EquilibriumMeasure {
  readonly engineVersion: string
  /** Inner radius r₀ (0 for a disk). */
  readonly inner: number
  /** Outer radius R. */
  readonly outer: number
}

export interface RadialPlaneOptions {
  /** Relative tolerance of the quadratures (default 1e-13). */
  tolerance?: number
}

const SOURCE = 'μ_V = ΔV/(4π) on the annulus r₀ ≤ |x| ≤ R with r₀V\'(r₀) = 0, RV\'(R) = 2 and Newton\'s theorem '
  + '(Saff & Totik, Logarithmic Potentials with External Fields, 1997, Thm IV.6.1 and §0.5)'

/** Root of an increasing function on [lo, hi] with g(lo) ≤ 0 ≤ g(hi), by bisection to machine precision. */
function bisect(g: (r: number) => number, lo: number, hi: number): number {
  for (let i = 0; i < 300; i++) {
    const mid = (lo + hi) / 2
    if (!(mid > lo && mid < hi)) break
    if (g(mid) <= 0) lo = mid
    else hi = mid
  }
  return (lo + hi) / 2
}

/**
 * The equilibrium measure of g = −log|x| in the plane for a radial V (d = 2) whose r V'(r) is non-decreasing,
 * with the closed-form potential above and the energies by quadrature.
 */
export function solveRadialPlaneEquilibrium(potential: Potential, options: RadialPlaneOptions = {}): RadialPlaneMeasure {
  if (potential.d !== 2) throw new EngineInputError(`the radial plane solver needs a potential on R² (d = 2), got d = ${potential.d}`)
  const profile = potential.radialProfile
  if (!potential.radial || profile === undefined) throw new EngineInputError(`the potential ${potential.text} is not radial; the plane solver needs V(x) = f(|x|)`)
  const tol = options.tolerance ?? 1e-13
  const f = (r: number): number => profile.v(r)
  const df = (r: number): number => profile.dv(r)
  const m = (r: number): number => r * df(r)

  // Outer radius: R f'(R) = 2.
  let hi = 1
  while (!(m(hi) >= 2)) {
    hi *= 2
    if (hi > 2 ** 60) throw new EngineInputError(`the potential ${potential.text} does not confine: r V'(r) stays below 2`)
  }
  let lo = hi / 2
  while (lo > 1e-300 && m(lo) >= 2) lo /= 2
  const R = bisect(r => m(r) - 2, lo, hi)

  // Inner radius: the last r with r f'(r) ≤ 0.
  const tiny = 1e-12 * R
  let r0 = 0
  if (m(tiny) <= 0) r0 = bisect(m, tiny, R)
  else if (m(tiny) > 1e-6) {
    throw new EngineInputError(`r V'(r) → ${m(tiny)} ≠ 0 as r → 0: V → −∞ at the origin and has no equilibrium measure`)
  }

  // Conditions of the theorem, checked on a grid: r f' ≤ 0 inside, non-decreasing on [r₀, R], ≥ 2 outside.
  const probes = 400
  let prev = -Infinity
  for (let k = 0; k <= probes; k++) {
    const r = r0 + (R - r0) * k / probes
    const v = k === 0 ? m(Math.max(r, tiny)) : m(r)
    if (v < prev - 1e-9 * 2) {
      throw new EngineInputError(`r V'(r) must be non-decreasing on the support; it decreases near r = ${r.toPrecision(6)}`)
    }
    prev = Math.max(prev, v)
  }
  for (let k = 1; k <= probes; k++) {
    const rIn = r0 * k / (probes + 1)
    if (r0 > 0 && m(rIn) > 1e-9) throw new EngineInputError(`r V'(r) must be ≤ 0 inside the hole; it is positive at r = ${rIn.toPrecision(6)}`)
    const rOut = R * (1 + 63 * k / probes)
    if (m(rOut) < 2 - 1e-9) throw new EngineInputError(`r V'(r) must stay ≥ 2 outside the support; it drops to ${m(rOut)} at r = ${rOut.toPrecision(6)}`)
  }

  const fR = f(R)
  const fr0 = f(r0)
  const cV = fR / 2 - Math.log(R)
  const byParts = integrateAdaptive(s => s * df(s) * df(s), r0, R, { absTol: 0, relTol: tol })
  const vMass = fR - byParts.value / 2
  // Independent check: ∫ f(s) ΔV(s)/(4π) 2πs ds = ½ ∫ f(s) s ΔV(s) ds.
  const lap = (s: number): number => potential.laplacian([s, 0], 0)
  const direct = integrateAdaptive(s => f(s) * s * lap(s) / 2, r0, R, { absTol: 0, relTol: tol })
  const selfEnergy = cV - vMass / 2
  const accuracy = Math.max(Math.abs(direct.value - vMass), byParts.error, 1e-15 * Math.max(1, Math.abs(cV)))

  const radiusOf = (points: ArrayLike<number>, offset: number): number => {
    const x = points[offset]
    const y = points[offset + 1]
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      throw new EngineInputError(`the point at offset ${offset} is not a pair of finite numbers`, { index: Math.floor(offset / 2) })
    }
    return Math.hypot(x, y)
  }
  const H = (r: number): number => (r >= R ? -Math.log(r) : -Math.log(R) + (fR - f(Math.max(r, r0))) / 2)
  const Z = (r: number): number => {
    if (r >= R) return (f(r) - fR) / 2 - Math.log(r / R)
    if (r < r0) return (f(r) - fr0) / 2
    return 0
  }
  return {
    d: 2,
    kernel: { name: 'log' },
    support: r0 > 0 ? { kind: 'annulus', inner: r0, outer: R } : { kind: 'ball', center: [0, 0], radius: R },
    method: 'numerical',
    accuracy,
    source: SOURCE,
    selfEnergy,
    IV: cV + vMass / 2,
    cV,
    engineVersion: ENGINE_VERSION,
    inner: r0,
    outer: R,
    density(points, offset = 0) {
      const r = radiusOf(points, offset)
      if (r < r0 || r > R) return 0
      return Math.max(0, potential.laplacian(points, offset) / (4 * Math.PI))
    },
    potential(points, offset = 0) {
      return H(radiusOf(points, offset))
    },
    sphereAverage(points, offset, eta) {
      const rho = radiusOf(points, offset)
      if (!(eta >= 0) || !Number.isFinite(eta)) throw new EngineInputError(`the radius η must be a finite number ≥ 0 (got ${eta})`, { index: Math.floor(offset / 2) })
      if (eta === 0) return H(rho)
      if (rho === 0) return H(eta)
      // |x + η e^{iθ}|² = ρ² + η² + 2ρη cos θ; average over θ ∈ [0, π] by symmetry, split where it meets r₀ or R.
      const radiusAt = (theta: number): number => Math.sqrt(Math.max(0, rho * rho + eta * eta + 2 * rho * eta * Math.cos(theta)))
      const breaks: number[] = []
      for (const edge of [r0, R]) {
        if (edge <= 0) continue
        const c = (edge * edge - rho * rho - eta * eta) / (2 * rho * eta)
        if (c > -1 && c < 1) breaks.push(Math.acos(c))
      }
      const res = integrateAdaptive(theta => H(radiusAt(theta)), 0, Math.PI, { absTol: 1e-15, relTol: 1e-13, breakpoints: breaks })
      return res.value / Math.PI
    },
    zeta(points, offset = 0) {
      return Z(radiusOf(points, offset))
    },
  }
}
