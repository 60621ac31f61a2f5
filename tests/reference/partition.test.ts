// Exact partition functions against Mehta's integral and Ginibre's formula, each also evaluated by
// quadrature of the defining integral here, and the large-N expansion against the exact values.
import { describe, it, expect } from 'vitest'
import { semicircleMeasure, uniformDiskMeasure } from '../../shared/physics/equilibrium/closed-forms'
import { integrateAdaptive } from '../../shared/physics/quadrature'
import { exactLogZ, gaussianLogZ, ginibreLogZ, logMehtaIntegral } from '../../shared/physics/partition/exact'
import { logZExpansion, measureEntropy } from '../../shared/physics/partition/expansion'
import { gaussHermite } from '../support/stat-samples'

/** ∫∫ |x − y|^β e^{−(x² + y²)/2} dx dy by nested adaptive Gauss–Kronrod, the kink at x = y a breakpoint. */
function mehtaByQuadrature(beta: number): number {
  const inner = (y: number): number => integrateAdaptive(x => Math.abs(x - y) ** beta * Math.exp(-x * x / 2), -14, 14, { breakpoints: [y], absTol: 1e-15, relTol: 1e-13 }).value
  return integrateAdaptive(y => inner(y) * Math.exp(-y * y / 2), -14, 14, { absTol: 1e-14, relTol: 1e-13 }).value
}

describe('Mehta\'s integral (Mehta, Random Matrices, 3rd ed. 2004, eq. 17.6.7)', () => {
  const published: Array<[number, number]> = [[1, 4 * Math.sqrt(Math.PI)], [2, 4 * Math.PI], [4, 24 * Math.PI]] // N = 2 values of the formula, 2π Γ(1 + β)/Γ(1 + β/2)
  for (const [beta, value] of published) {
    it(`N = 2, β = ${beta}: the formula, the published value and a 2-D quadrature agree`, () => {
      expect(Math.exp(logMehtaIntegral(2, beta))).toBeCloseTo(value, 12)
      expect(mehtaByQuadrature(beta) / value).toBeCloseTo(1, 11)
    })
  }

  it('N = 3, β = 2 by Gauss–Hermite quadrature (exact for the polynomial Π|Δ|²; A&S 25.4.46)', () => {
    // ∫ Π|Δ|² e^{−Σy²/2} dy = 2^{3/2 + 3} ∫ Π|Δ|² e^{−Σu²} du with y = √2 u
    const { x, w } = gaussHermite(5)
    let s = 0
    for (let i = 0; i < 5; i++) for (let j = 0; j < 5; j++) for (let k = 0; k < 5; k++) {
      s += w[i] * w[j] * w[k] * ((x[i] - x[j]) * (x[i] - x[k]) * (x[j] - x[k])) ** 2
    }
    const value = s * Math.pow(2, 1.5 + 3)
    expect(Math.exp(logMehtaIntegral(3, 2)) / value).toBeCloseTo(1, 12)
    // (2π)^{3/2} Γ(2)Γ(3)Γ(4)/Γ(2)³ = 12 (2π)^{3/2}
    expect(value / (12 * Math.pow(2 * Math.PI, 1.5))).toBeCloseTo(1, 12)
  })

  it('the canonical convention: log Z = −½(N + βN(N−1)/2) log(βNa) + log M_N(β) equals a direct quadrature at N = 2', () => {
    // Z = ∫∫ |x − y|^β e^{−(β/2)·2·a(x² + y²)} dx dy for N = 2
    for (const [beta, a] of [[1, 1], [2, 0.7], [4, 1.3]]) {
      const inner = (y: number): number => integrateAdaptive(x => Math.abs(x - y) ** beta * Math.exp(-beta * a * x * x), -10, 10, { breakpoints: [y], absTol: 1e-16, relTol: 1e-13 }).value
      const direct = integrateAdaptive(y => inner(y) * Math.exp(-beta * a * y * y), -10, 10, { absTol: 1e-16, relTol: 1e-13 }).value
      expect(gaussianLogZ(2, beta, a)).toBeCloseTo(Math.log(direct), 10)
    }
  })
})

describe('Ginibre\'s integral (Ginibre, J. Math. Phys. 6, 1965)', () => {
  it('∫ Π|z_i − z_j|² e^{−Σ|z_i|²} d²z = π^N Π k! for N = 1, 2, 3 by Gauss–Hermite quadrature in every real coordinate', () => {
    const { x, w } = gaussHermite(4) // exact: each real coordinate appears with degree ≤ 2(N − 1) = 4
    const factorials = [1, 1, 2, 6]
    for (let N = 1; N <= 3; N++) {
      const D = 2 * N
      let total = 0
      const idx = new Array<number>(D).fill(0)
      for (;;) {
        let weight = 1
        for (let k = 0; k < D; k++) weight *= w[idx[k]]
        let v = 1
        for (let i = 0; i < N; i++) {
          for (let j = i + 1; j < N; j++) {
            v *= (x[idx[2 * i]] - x[idx[2 * j]]) ** 2 + (x[idx[2 * i + 1]] - x[idx[2 * j + 1]]) ** 2
          }
        }
        total += weight * v
        let k = 0
        while (k < D && ++idx[k] === 4) idx[k++] = 0
        if (k === D) break
      }
      let published = Math.PI ** N
      for (let k = 1; k <= N; k++) published *= factorials[k]
      expect(total / published).toBeCloseTo(1, 12)
      // the canonical form with a = 1/N: Na = 1, so log Z = log(π^N Π k!)
      expect(ginibreLogZ(N, 1 / N)).toBeCloseTo(Math.log(published), 12)
    }
  })

  it('the canonical convention at N = 2 equals a direct 4-D integral reduced by rotation symmetry', () => {
    // Z = ∫ |z₁ − z₂|² e^{−2a(|z₁|² + |z₂|²)}: with u = (z₁ − z₂)/√2, v = (z₁ + z₂)/√2 (Jacobian 1),
    // Z = ∫ 2|u|² e^{−2a|u|²} d²u · ∫ e^{−2a|v|²} d²v, each radial integral by quadrature
    for (const a of [1, 0.3]) {
      const U = integrateAdaptive(r => 2 * r * r * Math.exp(-2 * a * r * r) * 2 * Math.PI * r, 0, 12).value
      const Vv = integrateAdaptive(r => Math.exp(-2 * a * r * r) * 2 * Math.PI * r, 0, 12).value
      expect(ginibreLogZ(2, a)).toBeCloseTo(Math.log(U * Vv), 11)
    }
  })

  it('refuses a β that is not canonical β = 2', () => {
    expect(() => exactLogZ({ ensemble: 'ginibre', N: 3, beta: 1 })).toThrow(/β = 2/)
  })
})

describe('large-N expansion of log Z against the exact Gaussian cases', () => {
  it('the entropy of the semicircle of radius √2 is ½ − log(π√2) and of the disk law log(1/π) (quadrature)', () => {
    expect(measureEntropy(semicircleMeasure(1))).toBeCloseTo(0.5 - Math.log(Math.PI * Math.SQRT2), 9)
    expect(measureEntropy(uniformDiskMeasure(1))).toBeCloseTo(-Math.log(Math.PI), 10)
  })

  for (const beta of [0.5, 1, 2, 4]) {
    it(`d = 1, β = ${beta}: exact − expansion converges to a constant like 1/N and does not depend on a`, () => {
      const rem = (N: number, a: number): number => gaussianLogZ(N, beta, a) - logZExpansion({ d: 1, N, beta, measure: semicircleMeasure(a) }).approximation
      const r1 = rem(250, 1)
      const r2 = rem(500, 1)
      const r3 = rem(1000, 1)
      // remainder C₀ + c/N + …: successive differences halve
      expect(Math.abs(r2 - r3)).toBeLessThan(0.6 * Math.abs(r1 - r2) + 1e-9)
      expect(Math.abs(r1 - r3)).toBeLessThan(5e-3)
      expect(rem(500, 2.5)).toBeCloseTo(r2, 6)
    })
  }

  it('d = 2, β = 2: exact − expansion (with the log N term 5/12) converges to a constant, independent of a', () => {
    const rem = (N: number, a: number): number => ginibreLogZ(N, a) - logZExpansion({ d: 2, N, beta: 2, measure: uniformDiskMeasure(a), quadraticPotential: true }).approximation
    const r1 = rem(250, 1)
    const r2 = rem(500, 1)
    const r3 = rem(1000, 1)
    expect(Math.abs(r2 - r3)).toBeLessThan(0.6 * Math.abs(r1 - r2) + 1e-9)
    expect(Math.abs(r1 - r3)).toBeLessThan(5e-3)
    expect(rem(500, 0.4)).toBeCloseTo(r2, 6)
  })

  it('d = 2, β ≠ 2: the N term is marked unavailable and left out of the approximation', () => {
    const e = logZExpansion({ d: 2, N: 100, beta: 3, measure: uniformDiskMeasure(1) })
    const nTerm = e.terms.find(t => t.order === 'N')
    expect(nTerm?.status).toBe('not available')
    expect(e.remainder).toBe('O(N)')
    expect(e.approximation).toBeCloseTo(-(3 / 2) * 0.75 * 1e4 + (3 / 4) * 100 * Math.log(100), 9) // I_V = 3/4 (uniform disk, a = 1; Saff & Totik 1997, ch. IV)
  })
})
