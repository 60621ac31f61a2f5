import { describe, it, expect } from 'vitest'
import { solveRadialPlaneEquilibrium } from '../../shared/physics/equilibrium/radial-plane'
import type { RadialPlaneMeasure } from '../../shared/physics/equilibrium/radial-plane'
import { doubleWellPotential, parsePotential, quadraticPotential, radialPowerPotential } from '../../shared/physics/potentials'
import type { Potential } from '../../shared/physics/potentials'
import { integrateAdaptive } from '../../shared/physics/quadrature'
import { EngineInputError } from '../../shared/physics/errors'
import { ENGINE_VERSION } from '../../shared/physics/version'

// h^μ(x) = −∫ log max(|x|, s) dM(s), dM(s) = 2πs ρ(s) ds (Newton's theorem for circles; Saff & Totik 1997, §0.5),
// evaluated by quadrature of a given radial density ρ on [r0, R] — independent of the closed form in the solver.
function newtonPotential(rho: (s: number) => number, r0: number, R: number, x: number): number {
  const bp = x > r0 && x < R ? [x] : []
  return integrateAdaptive(s => -Math.log(Math.max(x, s)) * 2 * Math.PI * s * rho(s), r0, R, { breakpoints: bp, absTol: 1e-15, relTol: 1e-14 }).value
}

function mass(rho: (s: number) => number, r0: number, R: number): number {
  return integrateAdaptive(s => 2 * Math.PI * s * rho(s), r0, R).value
}

/** ⟨u⟩ over the circle ∂B(x, η) for a function u of the point, by the trapezoidal rule in the angle (periodic: common practice). */
function circleAverage(u: (p: number[]) => number, x: number[], eta: number, n = 4096): number {
  let s = 0
  for (let k = 0; k < n; k++) {
    const t = 2 * Math.PI * (k + 0.5) / n
    s += u([x[0] + eta * Math.cos(t), x[1] + eta * Math.sin(t)])
  }
  return s / n
}

function checkEulerLagrange(m: RadialPlaneMeasure, V: Potential, tol: number): void {
  for (let k = 1; k <= 60; k++) {
    const r = 2 * m.outer * k / 60
    const p = [r * 0.6, r * 0.8]
    const el = m.potential(p) + V.value(p) / 2 - m.cV
    if (r >= m.inner && r <= m.outer) expect(Math.abs(el)).toBeLessThan(tol)
    else expect(el).toBeGreaterThan(-tol)
    expect(Math.abs(m.zeta(p) - el)).toBeLessThan(tol)
  }
}

describe('radial plane equilibrium, V = a|x|²: the uniform disk', () => {
  it('a = 1: radius 1, density 1/π, I_V = ¾, c_V = ½, ∬g = ¼ (Saff & Totik 1997, Ginibre 1965)', () => {
    const V = quadraticPotential(1, 2)
    const m = solveRadialPlaneEquilibrium(V)
    expect(m.support).toEqual({ kind: 'ball', center: [0, 0], radius: m.outer })
    expect(m.outer).toBeCloseTo(1, 15)
    expect(m.inner).toBe(0)
    expect(m.density([0.3, 0.2])).toBeCloseTo(1 / Math.PI, 15)
    expect(m.density([1.1, 0])).toBe(0)
    expect(m.IV).toBeCloseTo(0.75, 14)
    expect(m.cV).toBeCloseTo(0.5, 14)
    expect(m.selfEnergy).toBeCloseTo(0.25, 14)
    expect(m.engineVersion).toBe(ENGINE_VERSION)
    // h^μ = (1 − |x|²)/2 inside and −log|x| outside (Newton's theorem: elementary)
    expect(m.potential([0.3, 0.4])).toBeCloseTo((1 - 0.25) / 2, 15)
    expect(m.potential([3, 4])).toBeCloseTo(-Math.log(5), 15)
    checkEulerLagrange(m, V, 1e-13)
  })

  it('general a: radius 1/√a and density a/π', () => {
    const m = solveRadialPlaneEquilibrium(quadraticPotential(2.5, 2))
    expect(m.outer).toBeCloseTo(1 / Math.sqrt(2.5), 14)
    expect(m.density([0.1, 0.1])).toBeCloseTo(2.5 / Math.PI, 14)
    // push-forward of the a = 1 disk by 1/√a: ∬g = ¼ + ½ log a, ∫V dμ = ½
    expect(m.IV).toBeCloseTo(0.75 + 0.5 * Math.log(2.5), 13)
  })

  it('sphere averages: h^μ − ⟨h^μ⟩ = c_d m η²/(2d) = η²/2 inside; harmonic outside (h^μ is quadratic inside: elementary)', () => {
    const m = solveRadialPlaneEquilibrium(quadraticPotential(1, 2))
    expect(m.sphereAverage([0.2, 0.1], 0, 0.3)).toBeCloseTo(m.potential([0.2, 0.1]) - 0.045, 13)
    // the circle lies outside the disk and does not enclose the origin: mean-value property of −log|y|
    expect(m.sphereAverage([3, 0], 0, 0.5)).toBeCloseTo(-Math.log(3), 13)
    // a circle crossing the edge: compare with the trapezoidal rule in the angle
    const p = [0.7, 0.5]
    expect(m.sphereAverage(p, 0, 0.6)).toBeCloseTo(circleAverage(q => m.potential(q), p, 0.6), 11)
    // centred circle: h^μ(η)
    expect(m.sphereAverage([0, 0], 0, 0.5)).toBeCloseTo(m.potential([0.5, 0]), 15)
  })
})

describe('radial plane equilibrium, V = |x|⁴: a disk with density 4|x|²/π', () => {
  // Derived here from μ = ΔV/(4π) (Saff & Totik 1997, Thm IV.6.1): f = r⁴, ΔV = 16r², density 4r²/π,
  // mass inside r = 2r⁴ = r f'(r)/2, so R⁴ = ½. Newton's theorem: h^μ(0) = −∫_0^R log s · 8s³ ds = ¼ − log R,
  // c_V = h^μ(0) + V(0)/2 = ¼ + ¼ log 2, ∫V dμ = ∫_0^R s⁴ · 8s³ ds = R⁸ = ¼, I_V = c_V + ½∫V dμ = ⅜ + ¼ log 2.
  const V = radialPowerPotential(1, 4, 2)
  const m = solveRadialPlaneEquilibrium(V)
  const R = 0.5 ** 0.25

  it('has the radius, density and energies of the closed form', () => {
    expect(m.outer).toBeCloseTo(R, 15)
    expect(m.inner).toBe(0)
    expect(m.density([0.3, 0.4])).toBeCloseTo(4 * 0.25 / Math.PI, 14)
    expect(m.cV).toBeCloseTo(0.25 + 0.25 * Math.LN2, 14)
    expect(m.IV).toBeCloseTo(0.375 + 0.25 * Math.LN2, 13)
    expect(m.selfEnergy).toBeCloseTo(0.125 + 0.25 * Math.LN2, 13)
    expect(m.accuracy).toBeLessThan(1e-12)
  })

  it('h^μ agrees with Newton\'s theorem integrated against the density', () => {
    const rho = (s: number) => 4 * s * s / Math.PI
    expect(mass(rho, 0, R)).toBeCloseTo(1, 14)
    for (const r of [0, 0.2, 0.5, R, 1.3, 4]) {
      expect(m.potential([r, 0])).toBeCloseTo(newtonPotential(rho, 0, R, r), 13)
    }
    checkEulerLagrange(m, V, 1e-13)
  })
})

describe('radial plane equilibrium, annuli', () => {
  it('V = |x|⁴ − 2|x|²: annulus 1 ≤ |x| ≤ √((1 + √3)/2), density (4|x|² − 2)/π', () => {
    // Derived here: r f'(r) = 4r⁴ − 4r² vanishes at r₀ = 1 and equals 2 at R² = (1 + √3)/2 (Saff & Totik 1997,
    // Thm IV.6.1); ΔV/(4π) = (16r² − 8)/(4π). h^μ by Newton's theorem; c_V = h^μ at a support point + V/2.
    const V = doubleWellPotential(2, 1, 2)
    const m = solveRadialPlaneEquilibrium(V)
    const R = Math.sqrt((1 + Math.sqrt(3)) / 2)
    expect(m.support.kind).toBe('annulus')
    expect(m.inner).toBeCloseTo(1, 14)
    expect(m.outer).toBeCloseTo(R, 14)
    const rho = (s: number) => (4 * s * s - 2) / Math.PI
    expect(m.density([0.6, 0.9])).toBeCloseTo(rho(Math.hypot(0.6, 0.9)), 14)
    expect(m.density([0.5, 0])).toBe(0)
    expect(mass(rho, 1, R)).toBeCloseTo(1, 13)
    for (const r of [0, 0.5, 1, 1.1, R, 2]) {
      expect(m.potential([0, r])).toBeCloseTo(newtonPotential(rho, 1, R, r), 12)
    }
    const f = (r: number) => r ** 4 - 2 * r * r
    const cV = newtonPotential(rho, 1, R, 1.05) + f(1.05) / 2
    const vMass = integrateAdaptive(s => f(s) * 2 * Math.PI * s * rho(s), 1, R).value
    expect(m.cV).toBeCloseTo(cV, 12)
    expect(m.IV).toBeCloseTo(cV + vMass / 2, 12)
    expect(m.selfEnergy).toBeCloseTo(cV - vMass / 2, 12)
    checkEulerLagrange(m, V, 1e-12)
    // ζ > 0 in the hole: (f(r) − f(r₀))/2
    expect(m.zeta([0, 0])).toBeCloseTo(0.5, 14)
    // the same potential typed as an expression gives the same measure
    const P = solveRadialPlaneEquilibrium(parsePotential('r^4 - 2*r^2', { d: 2 }))
    expect(P.IV).toBeCloseTo(m.IV, 13)
    expect(P.inner).toBeCloseTo(m.inner, 13)
  })

  it('V = |x|² − log|x|: the uniform annulus 1/√2 ≤ |x| ≤ √(3/2) with density 1/π', () => {
    // Derived here: r f'(r) = 2r² − 1, so r₀² = ½ and R² = 3/2; ΔV = 4 (log|x| is harmonic), density 1/π,
    // mass π(3/2 − 1/2)/π = 1 (Saff & Totik 1997, Thm IV.6.1).
    const V = parsePotential('r^2 - log(r)', { d: 2 })
    const m = solveRadialPlaneEquilibrium(V)
    expect(m.inner).toBeCloseTo(Math.SQRT1_2, 14)
    expect(m.outer).toBeCloseTo(Math.sqrt(1.5), 14)
    expect(m.density([1, 0])).toBeCloseTo(1 / Math.PI, 12)
    const rho = () => 1 / Math.PI
    for (const r of [0.3, 0.8, 1.2, 3]) expect(m.potential([r, 0])).toBeCloseTo(newtonPotential(rho, Math.SQRT1_2, Math.sqrt(1.5), r), 12)
    checkEulerLagrange(m, V, 1e-12)
    // a circle around a point in the hole that crosses the annulus: trapezoidal rule in the angle
    const p = [0.4, 0.2]
    expect(m.sphereAverage(p, 0, 0.5)).toBeCloseTo(circleAverage(q => m.potential(q), p, 0.5), 11)
  })
})

describe('radial plane equilibrium: bad input', () => {
  it('rejects non-radial potentials, wrong dimensions, non-confining V and r V′ that decreases', () => {
    expect(() => solveRadialPlaneEquilibrium(parsePotential('x^2 + 2*y^2', { d: 2 }))).toThrow(/not radial/)
    expect(() => solveRadialPlaneEquilibrium(quadraticPotential(1, 3))).toThrow(EngineInputError)
    expect(() => solveRadialPlaneEquilibrium(parsePotential('0.5*log(1 + r^2)', { d: 2 }))).toThrow(/does not confine/)
    // r f' = 2r² − 1.6 r sin 8r decreases near r = 0.8 (ΔV < 0 there)
    expect(() => solveRadialPlaneEquilibrium(parsePotential('r^2 + 0.2*cos(8*r)', { d: 2 }))).toThrow(/non-decreasing/)
    expect(() => solveRadialPlaneEquilibrium(parsePotential('r^2 + log(r)', { d: 2 }))).toThrow(/origin/)
  })
})
