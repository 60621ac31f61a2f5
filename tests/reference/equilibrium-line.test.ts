import { describe, it, expect } from 'vitest'
import {
  gaussChebyshevFirst, gaussLegendre, gaussLegendreOn, integrateAdaptive, integrateTanhSinh, kronrod15,
} from '../../shared/physics/quadrature'
import { solveLineEquilibrium } from '../../shared/physics/equilibrium/numerical-line'
import type { LineEquilibriumMeasure } from '../../shared/physics/equilibrium/numerical-line'
import { doubleWellPotential, parsePotential, quadraticPotential, quarticPotential } from '../../shared/physics/potentials'
import type { Potential } from '../../shared/physics/potentials'
import { EngineInputError } from '../../shared/physics/errors'
import { ENGINE_VERSION } from '../../shared/physics/version'

describe('quadrature', () => {
  it('Gauss–Legendre: the closed-form rules for n = 2 and 3', () => {
    // Abramowitz & Stegun 1964, Table 25.4: n = 2 nodes ±1/√3, weights 1; n = 3 nodes 0, ±√(3/5), weights 8/9, 5/9
    const two = gaussLegendre(2)
    expect(two.nodes[1]).toBeCloseTo(1 / Math.sqrt(3), 15)
    expect(two.weights[0]).toBeCloseTo(1, 15)
    const three = gaussLegendre(3)
    expect(three.nodes[2]).toBeCloseTo(Math.sqrt(3 / 5), 15)
    expect(three.nodes[1]).toBe(0)
    expect(three.weights[1]).toBeCloseTo(8 / 9, 15)
    expect(three.weights[0]).toBeCloseTo(5 / 9, 15)
  })

  it('Gauss–Legendre with n nodes integrates x^k exactly for k ≤ 2n − 1 (A&S 25.4.29)', () => {
    for (const n of [1, 4, 7, 12, 25, 40]) {
      const { nodes, weights } = gaussLegendre(n)
      for (let k = 0; k <= 2 * n - 1; k++) {
        let s = 0
        for (let i = 0; i < n; i++) s += weights[i] * nodes[i] ** k
        expect(Math.abs(s - (k % 2 === 0 ? 2 / (k + 1) : 0))).toBeLessThan(1e-14)
      }
    }
    // a high order: ∫_0^3 cos = sin 3
    const rule = gaussLegendreOn(200, 0, 3)
    let s = 0
    for (let i = 0; i < 200; i++) s += rule.weights[i] * Math.cos(rule.nodes[i])
    expect(s).toBeCloseTo(Math.sin(3), 13)
  })

  it('Kronrod 15: embeds the 7-point Gauss rule and is exact to degree 22 (Kronrod 1965)', () => {
    const k = kronrod15()
    const g7 = gaussLegendre(7)
    for (let j = 0; j < 7; j++) {
      expect(k.nodes[2 * j + 1]).toBeCloseTo(g7.nodes[j], 15)
      expect(k.gaussWeights[2 * j + 1]).toBeCloseTo(g7.weights[j], 15)
    }
    for (let deg = 0; deg <= 22; deg++) {
      let s = 0
      for (let i = 0; i < 15; i++) s += k.kronrodWeights[i] * k.nodes[i] ** deg
      expect(Math.abs(s - (deg % 2 === 0 ? 2 / (deg + 1) : 0))).toBeLessThan(1e-15)
    }
  })

  it('adaptive G7K15 meets its tolerance on smooth, kinked and singular integrands', () => {
    const a = integrateAdaptive(Math.sin, 0, Math.PI)
    expect(a.value).toBeCloseTo(2, 14)
    const b = integrateAdaptive(x => Math.abs(x - 0.3), 0, 1, { breakpoints: [0.3] })
    expect(b.value).toBeCloseTo(0.3 ** 2 / 2 + 0.7 ** 2 / 2, 15)
    const c = integrateAdaptive(Math.sqrt, 0, 1, { absTol: 1e-13, relTol: 0 })
    expect(Math.abs(c.value - 2 / 3)).toBeLessThan(1e-12)
    expect(c.error).toBeLessThan(1e-12)
    expect(integrateAdaptive(x => x, 1, 0).value).toBeCloseTo(-0.5, 15)
  })

  it('tanh–sinh handles endpoint singularities', () => {
    expect(integrateTanhSinh(Math.log, 0, 1).value).toBeCloseTo(-1, 13)
    expect(integrateTanhSinh(x => x ** -0.5, 0, 1).value).toBeCloseTo(2, 12)
    expect(integrateTanhSinh(x => Math.sqrt(1 - x * x), -1, 1).value).toBeCloseTo(Math.PI / 2, 13)
    expect(integrateTanhSinh(x => Math.log(Math.abs(x - 0.25)), 0.25, 2).value).toBeCloseTo(1.75 * Math.log(1.75) - 1.75, 12)
  })

  it('Gauss–Chebyshev integrates T_4² against 1/√(1 − s²) to π/2 (A&S 22.2.4)', () => {
    const { nodes, weights } = gaussChebyshevFirst(10)
    let s = 0
    for (let i = 0; i < 10; i++) s += weights[i] * Math.cos(4 * Math.acos(nodes[i])) ** 2
    expect(s).toBeCloseTo(Math.PI / 2, 14)
  })
})

// h^μ(x) = −∫ log|x − y| ρ(y) dy by tanh–sinh on each interval, split at x (independent of the solver).
function potentialByQuadrature(rho: (y: number) => number, intervals: Array<[number, number]>, x: number): number {
  let s = 0
  for (const [a, b] of intervals) {
    const f = (y: number): number => -Math.log(Math.abs(x - y)) * rho(y)
    if (x > a && x < b) s += integrateTanhSinh(f, a, x).value + integrateTanhSinh(f, x, b).value
    else s += integrateTanhSinh(f, a, b).value
  }
  return s
}

function integrateDensity(f: (y: number) => number, intervals: Array<[number, number]>): number {
  return intervals.reduce((s, [a, b]) => s + integrateTanhSinh(f, a, b).value, 0)
}

/** I_V, c_V and the self-energy from a published density, by quadrature (c from h^μ at one support point). */
function energiesFromDensity(V: (x: number) => number, rho: (y: number) => number, intervals: Array<[number, number]>, x0: number) {
  const c = potentialByQuadrature(rho, intervals, x0) + V(x0) / 2
  const vMass = integrateDensity(y => V(y) * rho(y), intervals)
  return { cV: c, IV: c + vMass / 2, selfEnergy: c - vMass / 2 }
}

const at = (m: LineEquilibriumMeasure, x: number) => ({
  rho: m.density([x]), h: m.potential([x]), zeta: m.zeta([x]),
})

function checkEulerLagrange(m: LineEquilibriumMeasure, V: Potential, box: [number, number], tol: number): void {
  const intervals = m.support.kind === 'intervals' ? m.support.intervals : []
  for (const [a, b] of intervals) {
    for (let k = 0; k <= 50; k++) {
      const x = a + (b - a) * k / 50
      expect(Math.abs(m.potential([x]) + V.value([x]) / 2 - m.cV)).toBeLessThan(tol)
    }
  }
  for (let k = 0; k <= 400; k++) {
    const x = box[0] + (box[1] - box[0]) * k / 400
    expect(m.potential([x]) + V.value([x]) / 2 - m.cV).toBeGreaterThan(-tol)
    expect(m.zeta([x])).toBeGreaterThan(-tol)
  }
}

describe('line equilibrium measure, V = x²: the semicircle', () => {
  const V = quadraticPotential(1, 1)
  const m = solveLineEquilibrium(V)

  it('has support [−√2, √2] and the semicircle density (1/π)√(2 − x²)', () => {
    // Saff & Totik 1997, ch. IV.5; Forrester 2010, §1.4: density (a/π)√(2/a − x²) on |x| ≤ √(2/a)
    expect(m.support.kind).toBe('intervals')
    if (m.support.kind !== 'intervals') return
    expect(m.support.intervals).toHaveLength(1)
    expect(m.support.intervals[0][0]).toBeCloseTo(-Math.SQRT2, 12)
    expect(m.support.intervals[0][1]).toBeCloseTo(Math.SQRT2, 12)
    let err = 0
    for (let k = 0; k <= 2000; k++) {
      const x = -1.6 + 3.2 * k / 2000
      err = Math.max(err, Math.abs(m.density([x]) - Math.sqrt(Math.max(0, 2 - x * x)) / Math.PI))
    }
    expect(err).toBeLessThan(1e-10)
    expect(m.method).toBe('numerical')
    expect(m.engineVersion).toBe(ENGINE_VERSION)
  })

  it('has I_V = ½ log 2 + ¾, ∬ g = ½ log 2 + ¼, c_V = ½ log 2 + ½', () => {
    // Saff & Totik 1997; Forrester 2010; c_V = ∬g + ½∫V with ∫x² dμ = ½ (second moment of the semicircle)
    expect(Math.abs(m.IV - (0.5 * Math.LN2 + 0.75))).toBeLessThan(1e-10)
    expect(Math.abs(m.selfEnergy - (0.5 * Math.LN2 + 0.25))).toBeLessThan(1e-10)
    expect(Math.abs(m.cV - (0.5 * Math.LN2 + 0.5))).toBeLessThan(1e-10)
    expect(m.accuracy).toBeLessThan(1e-10)
  })

  it('gives h^μ equal to the quadrature of the log kernel against the semicircle, inside and outside', () => {
    const rho = (y: number) => Math.sqrt(Math.max(0, 2 - y * y)) / Math.PI
    for (const x of [0, 0.37, -1.2, 1.41, 1.6, -2.5, 7]) {
      expect(m.potential([x])).toBeCloseTo(potentialByQuadrature(rho, [[-Math.SQRT2, Math.SQRT2]], x), 11)
    }
    checkEulerLagrange(m, V, [-4, 4], 1e-10)
    // ζ vanishes on the support and grows outside
    expect(at(m, 0.5).zeta).toBe(0)
    expect(at(m, 2).zeta).toBeGreaterThan(0.01)
  })

  it('averages h^μ over the two points x ± η', () => {
    expect(m.sphereAverage([0.2], 0, 0.1)).toBeCloseTo((m.potential([0.1]) + m.potential([0.3])) / 2, 15)
    // inside the support h^μ = c_V − x²/2, so the average of x ± η is h^μ(x) − η²/2 when both stay inside
    expect(m.sphereAverage([0.2], 0, 0.1)).toBeCloseTo(m.potential([0.2]) - 0.005, 11)
  })

  it('scales with a: V = 3x² has density (3/π)√(2/3 − x²)', () => {
    // Saff & Totik 1997: density (a/π)√(2/a − x²)
    const m3 = solveLineEquilibrium(quadraticPotential(3, 1))
    for (const x of [0, 0.3, -0.7, 0.8]) {
      expect(m3.density([x])).toBeCloseTo(3 / Math.PI * Math.sqrt(Math.max(0, 2 / 3 - x * x)), 10)
    }
    // push-forward by √(1/3) of the a = 1 measure: ∬g grows by ½ log 3, ∫V dμ stays ½
    expect(m3.IV).toBeCloseTo(0.5 * Math.LN2 + 0.75 + 0.5 * Math.log(3), 10)
  })
})

describe('line equilibrium measure, quartic potentials (Brézin, Itzykson, Parisi & Zuber 1978)', () => {
  // BIPZ, Commun. Math. Phys. 59 (1978), eq. for the planar density: for V(λ) = λ²/2 + g λ⁴ the density is
  //   u(λ) = (1/π)(1/2 + 4g a² + 2g λ²) √(4a² − λ²),  12 g a⁴ + a² = 1.
  // Translation: BIPZ's saddle point is p.v.∫ u(μ)/(λ − μ) dμ = V'(λ)/2 for the weight exp(−N Σ V(λ_i)) Π|Δ|²,
  // and our Euler–Lagrange equation h^μ + V/2 = c differentiates to the same p.v.∫ dμ(y)/(x − y) = V'(x)/2:
  // the normalisations coincide, V_ours = V_BIPZ. (Check: g = 0 gives radius 2 for V = λ²/2, as the semicircle
  // (a/π)√(2/a − x²) with a = ½.) With g = 1: a² = 1/4, support [−1, 1], u = (1/π)(3/2 + 2λ²)√(1 − λ²).
  it('V = x²/2 + x⁴ (g = 1): support [−1, 1] and the BIPZ density', () => {
    const V = quarticPotential(0.5, 1, 1)
    const m = solveLineEquilibrium(V)
    if (m.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(m.support.intervals).toHaveLength(1)
    expect(m.support.intervals[0][0]).toBeCloseTo(-1, 12)
    expect(m.support.intervals[0][1]).toBeCloseTo(1, 12)
    const u = (x: number) => (1.5 + 2 * x * x) * Math.sqrt(Math.max(0, 1 - x * x)) / Math.PI
    for (let k = 0; k <= 200; k++) {
      const x = -1.1 + 2.2 * k / 200
      expect(Math.abs(m.density([x]) - u(x))).toBeLessThan(1e-10)
    }
    // I_V from the published density by quadrature (c_V from h^μ(0), then I_V = c_V + ½∫V dμ)
    const ref = energiesFromDensity(x => V.value([x]), u, [[-1, 1]], 0)
    expect(m.IV).toBeCloseTo(ref.IV, 10)
    expect(m.cV).toBeCloseTo(ref.cV, 10)
    expect(m.selfEnergy).toBeCloseTo(ref.selfEnergy, 10)
    // BIPZ planar energy E(g) = (1/24)(a² − 1)(9 − a²) − ½ log a² relative to g = 0 (value recalled from memory),
    // with I_V(g = 0) = ¾ for V = x²/2 (push-forward of the a = 1 semicircle by √2: ∬g = ½log2 + ¼ − ½log2, ∫V = ½)
    const a2 = 0.25
    const E = (a2 - 1) * (9 - a2) / 24 - 0.5 * Math.log(a2)
    expect(m.IV).toBeCloseTo(0.75 + E, 10)
    checkEulerLagrange(m, V, [-3, 3], 1e-10)
  })

  it('V = x²/2 + g x⁴ for g = 0.1: a² = (√(1 + 48g) − 1)/(24g)', () => {
    const g = 0.1
    const a2 = (Math.sqrt(1 + 48 * g) - 1) / (24 * g)
    const m = solveLineEquilibrium(quarticPotential(0.5, g, 1))
    if (m.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(m.support.intervals[0][1]).toBeCloseTo(2 * Math.sqrt(a2), 11)
    const u = (x: number) => (0.5 + 4 * g * a2 + 2 * g * x * x) * Math.sqrt(Math.max(0, 4 * a2 - x * x)) / Math.PI
    for (const x of [0, 0.5, -1.1, 1.5]) expect(m.density([x])).toBeCloseTo(u(x), 10)
    expect(m.IV).toBeCloseTo(0.75 + (a2 - 1) * (9 - a2) / 24 - 0.5 * Math.log(a2), 10)
  })

  it('V = x⁴/4: the g → ∞ limit of BIPZ, density (1/π)(A² + x²/2)√(4A² − x²), A⁴ = 1/3', () => {
    // Derived from BIPZ by the push-forward y = λ/s, s = (4g)^(−1/4) (V(sy) = s²y²/2 + y⁴/4 → y⁴/4 as g → ∞):
    // with A = a/s, 12 g a⁴ + a² = 1 becomes 3A⁴ + s²A² = 1 → A⁴ = 1/3 and s·u(sy) → (1/π)(A² + y²/2)√(4A² − y²).
    const A2 = 1 / Math.sqrt(3)
    const V = quarticPotential(0, 0.25, 1)
    const m = solveLineEquilibrium(V)
    if (m.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(m.support.intervals[0][1]).toBeCloseTo(2 * Math.sqrt(A2), 12)
    const u = (x: number) => (A2 + x * x / 2) * Math.sqrt(Math.max(0, 4 * A2 - x * x)) / Math.PI
    let err = 0
    for (let k = 0; k <= 400; k++) err = Math.max(err, Math.abs(m.density([-1.6 + 3.2 * k / 400]) - u(-1.6 + 3.2 * k / 400)))
    expect(err).toBeLessThan(1e-10)
    const ref = energiesFromDensity(x => V.value([x]), u, [[-2 * Math.sqrt(A2), 2 * Math.sqrt(A2)]], 0.3)
    expect(m.IV).toBeCloseTo(ref.IV, 10)
    checkEulerLagrange(m, V, [-3, 3], 1e-10)
  })
})

describe('line equilibrium measure, double wells: two intervals', () => {
  // V = x⁴/4 − (t/2)x² with t = 3 (the preset b|x|⁴ − a|x|² with a = 3/2, b = 1/4). For an even quartic with two
  // cuts the resolvent G(z) = ∫dμ(y)/(z − y) = V'(z)/2 − (z/2)√((z² − α²)(z² − β²)) must decay like 1/z
  // (Deift 1999, ch. 6, the g-function construction), which forces α² + β² = 2t and (β² − α²)² = 16:
  // α² = t − 2 = 1, β² = t + 2 = 5, density ρ(x) = (1/(2π))|x|√((5 − x²)(x² − 1)) on [−√5, −1] ∪ [1, √5].
  // (Derived in this comment; its mass is (1/2π)·2·(1/2)·π(β² − α²)²/8 = 1.)
  const V = doubleWellPotential(1.5, 0.25, 1)
  const m = solveLineEquilibrium(V)
  const rho = (x: number) => Math.abs(x) * Math.sqrt(Math.max(0, (5 - x * x) * (x * x - 1))) / (2 * Math.PI)
  const cuts: Array<[number, number]> = [[-Math.sqrt(5), -1], [1, Math.sqrt(5)]]

  it('finds two symmetric intervals [−√5, −1] ∪ [1, √5], each of mass ½', () => {
    if (m.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(m.support.intervals).toHaveLength(2)
    const [[a0, b0], [a1, b1]] = m.support.intervals
    expect(a0).toBeCloseTo(-Math.sqrt(5), 11)
    expect(b0).toBeCloseTo(-1, 11)
    expect(a1).toBeCloseTo(1, 11)
    expect(b1).toBeCloseTo(Math.sqrt(5), 11)
    expect(a0 + b1).toBeCloseTo(0, 11)
    expect(b0 + a1).toBeCloseTo(0, 11)
    expect(m.intervalMasses[0]).toBeCloseTo(0.5, 12)
    expect(m.intervalMasses[0] + m.intervalMasses[1]).toBeCloseTo(1, 13)
    // total mass by quadrature of the returned density
    expect(integrateDensity(x => m.density([x]), m.support.intervals)).toBeCloseTo(1, 10)
  })

  it('matches the two-cut density and the energies computed from it', () => {
    // Sup-error over a grid that hits the edges ±1 exactly: at a √-edge an endpoint error δ (rounding, ≈ 1e-13)
    // becomes a density error ≈ √δ next to the edge, so the sup bound is 1e-6; 1e-3 away from the edges it is 1e-10.
    let err = 0
    let errInterior = 0
    for (let k = 0; k <= 1000; k++) {
      const x = -2.5 + 5 * k / 1000
      const e = Math.abs(m.density([x]) - rho(x))
      err = Math.max(err, e)
      if (cuts.every(([a, b]) => Math.abs(x - a) > 1e-3 && Math.abs(x - b) > 1e-3)) errInterior = Math.max(errInterior, e)
    }
    expect(err).toBeLessThan(1e-6)
    expect(errInterior).toBeLessThan(1e-10)
    expect(m.density([0])).toBe(0)
    const ref = energiesFromDensity(x => V.value([x]), rho, cuts, 1.5)
    expect(m.IV).toBeCloseTo(ref.IV, 9)
    expect(m.cV).toBeCloseTo(ref.cV, 9)
  })

  it('satisfies h^μ + V/2 = c_V on both intervals and ≥ c_V outside, including the gap', () => {
    checkEulerLagrange(m, V, [-4, 4], 1e-9)
    for (const x of [-1.8, -0.5, 0, 0.99, 1.2, 3]) {
      expect(m.potential([x])).toBeCloseTo(potentialByQuadrature(rho, cuts, x), 9)
    }
    expect(m.zeta([0])).toBeGreaterThan(0.05)
    expect(m.accuracy).toBeLessThan(1e-9)
  })

  it('solves an asymmetric double well typed as an expression (Euler–Lagrange checks only)', () => {
    const W = parsePotential('x^4/4 - 1.5*x^2 + 0.3*x', { d: 1 })
    const w = solveLineEquilibrium(W)
    if (w.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(w.support.intervals).toHaveLength(2)
    expect(w.intervalMasses[0]).toBeGreaterThan(0.5) // the deeper well is on the left (V' > 0 tilt)
    expect(integrateDensity(x => w.density([x]), w.support.intervals)).toBeCloseTo(1, 10)
    checkEulerLagrange(w, W, [-4, 4], 1e-9)
    const wRho = (x: number) => w.density([x])
    for (const x of [-2, 0, 1.5]) expect(w.potential([x])).toBeCloseTo(potentialByQuadrature(wRho, w.support.intervals, x), 8)
    for (let k = 0; k <= 200; k++) expect(w.density([-3 + 6 * k / 200])).toBeGreaterThanOrEqual(0)
  })
})

describe('line equilibrium measure, more cuts and the two-cut family', () => {
  it('V = x⁴/4 − (t/2)x² for t = 2.1 and t = 1.8: inner edges at √(t − 2) above t = 2, one cut below', () => {
    // The two-cut formula derived above holds for every t > 2 (α² = t − 2, β² = t + 2); for t < 2 the one-cut
    // solution (1/(2π))(x² + c)√(b² − x²) has c = b²/2 − t > 0 with 3b⁴/16 − t b²/4 = 1 (same resolvent argument).
    const two = solveLineEquilibrium(parsePotential('x^4/4 - 1.05*x^2', { d: 1 }))
    if (two.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(two.support.intervals).toHaveLength(2)
    expect(two.support.intervals[1][0]).toBeCloseTo(Math.sqrt(0.1), 10)
    expect(two.support.intervals[1][1]).toBeCloseTo(Math.sqrt(4.1), 11)
    const one = solveLineEquilibrium(parsePotential('x^4/4 - 0.9*x^2', { d: 1 }))
    if (one.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(one.support.intervals).toHaveLength(1)
    const t = 1.8
    const b2 = (2 * t + Math.sqrt(4 * t * t + 48)) / 3 // root of 3b⁴/16 − t b²/4 − 1 = 0
    expect(one.support.intervals[0][1]).toBeCloseTo(Math.sqrt(b2), 11)
    expect(one.density([0.4])).toBeCloseTo((0.16 + b2 / 2 - t) * Math.sqrt(b2 - 0.16) / (2 * Math.PI), 10)
  })

  // Polynomial pull-back (derived here; cf. Ransford, Potential Theory in the Complex Plane, 1995, §5.2 on
  // polynomial preimages): for P of degree n with leading coefficient 1, log|P(x) − u| = Σ_k log|x − y_k(u)|
  // over the n preimages y_k(u), so μ = (1/n)·(pull-back of ν) has h^μ(x) = h^ν(P(x))/n. With V = P²/c the
  // Euler–Lagrange conditions for μ become those of W(u) = n u²/c for ν: ν is the semicircle (Saff & Totik 1997)
  // with a = n/c, provided every level P = u, |u| ≤ √(2/a), has n real roots. Then the support has n intervals of
  // mass 1/n, ρ_V(x) = ρ_W(P(x))|P'(x)|/n, and I_V = ∬g dν dν / n + ∫u²/c dν.
  it('V = ((x² − 1)(x² − 9))²/100: four intervals, the pull-back of a semicircle', () => {
    const P = (x: number) => (x * x - 1) * (x * x - 9)
    const dP = (x: number) => 4 * x ** 3 - 20 * x
    const V = parsePotential('(x^2 - 1)^2 * (x^2 - 9)^2 / 100', { d: 1 })
    const m = solveLineEquilibrium(V)
    if (m.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(m.support.intervals).toHaveLength(4)
    // n = 4, a = 0.04: ν is (a/π)√(50 − u²); |P| at the critical points (9 at 0, 16 at x² = 5) exceeds √50
    // endpoints: P(x) = ±√50, i.e. x² = 5 ± √(16 ± √50)
    const s50 = Math.sqrt(50)
    const edges = [5 - Math.sqrt(16 + s50), 5 - Math.sqrt(16 - s50), 5 + Math.sqrt(16 - s50), 5 + Math.sqrt(16 + s50)].map(Math.sqrt)
    const iv = m.support.intervals
    expect(iv[2][0]).toBeCloseTo(edges[0], 10)
    expect(iv[2][1]).toBeCloseTo(edges[1], 10)
    expect(iv[3][0]).toBeCloseTo(edges[2], 10)
    expect(iv[3][1]).toBeCloseTo(edges[3], 10)
    expect(iv[0][0]).toBeCloseTo(-edges[3], 10)
    for (const mass of m.intervalMasses) expect(mass).toBeCloseTo(0.25, 11)
    const rho = (x: number) => 0.04 / Math.PI * Math.sqrt(Math.max(0, 50 - P(x) ** 2)) * Math.abs(dP(x)) / 4
    for (const x of [0.6, -1.2, 2.9, 3.05, -3.1]) expect(m.density([x])).toBeCloseTo(rho(x), 10)
    // ∬g dν dν = ½log 2 + ¼ − log 5 (the a = 1 value pushed forward by 5), ∫u² dν = 25/2
    expect(m.IV).toBeCloseTo((0.5 * Math.LN2 + 0.25 - Math.log(5)) / 4 + 12.5 / 100, 10)
    checkEulerLagrange(m, V, [-4, 4], 1e-10)
  })

  it('V = (x(x² − 4))²/5: three intervals of mass ⅓ (the same pull-back, n = 3)', () => {
    const V = parsePotential('x^2 * (x^2 - 4)^2 / 5', { d: 1 })
    const m = solveLineEquilibrium(V)
    if (m.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(m.support.intervals).toHaveLength(3)
    for (const mass of m.intervalMasses) expect(mass).toBeCloseTo(1 / 3, 11)
    // a = 3/5: ν on |u| ≤ √(10/3); the middle interval is {|x(x² − 4)| ≤ √(10/3)} around 0
    const u = Math.sqrt(10 / 3)
    const inner = m.support.intervals[1][1]
    expect(Math.abs(inner * (inner * inner - 4))).toBeCloseTo(u, 10)
    // the log-energy of a pull-back: ∬g dμ dμ = (½log 2 + ¼ − ½ log(1/a))/3 with a = 3/5, ∫V dμ = ∫u²/5 dν = 1/(2a)/5
    const a = 0.6
    expect(m.IV).toBeCloseTo((0.5 * Math.LN2 + 0.25 + 0.5 * Math.log(a)) / 3 + 1 / (2 * a) / 5, 10)
    checkEulerLagrange(m, V, [-3, 3], 1e-10)
  })
})

describe('line equilibrium measure, non-polynomial V and bad input', () => {
  it('V = cosh(x): one interval, mass 1, Euler–Lagrange to the stated accuracy', () => {
    const V = parsePotential('cosh(x)', { d: 1 })
    const m = solveLineEquilibrium(V)
    if (m.support.kind !== 'intervals') throw new Error('expected intervals')
    expect(m.support.intervals).toHaveLength(1)
    expect(integrateDensity(x => m.density([x]), m.support.intervals)).toBeCloseTo(1, 10)
    checkEulerLagrange(m, V, [-5, 5], Math.max(1e-9, 10 * m.accuracy))
    const ref = energiesFromDensity(x => V.value([x]), x => m.density([x]), m.support.intervals, 0.2)
    expect(m.IV).toBeCloseTo(ref.IV, 9)
  })

  it('rejects potentials of the wrong dimension and non-confining ones', () => {
    expect(() => solveLineEquilibrium(quadraticPotential(1, 2))).toThrow(EngineInputError)
    expect(() => solveLineEquilibrium(parsePotential('x', { d: 1 }))).toThrow(/does not confine/)
  })
})
