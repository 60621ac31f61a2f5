// Chebyshev coefficients, integrals against equilibrium measures and the spacing/density helpers.
import { describe, it, expect } from 'vitest'
import { semicircleMeasure, uniformDiskMeasure, uniformBallMeasure } from '../../../../shared/physics/equilibrium/closed-forms'
import { chebyshevCoefficients, integrateAgainst, johanssonVariance, linearStatistic } from '../../../../shared/physics/statistics/linear-statistics'
import { equilibriumCdf, unfoldedSpacings } from '../../../../shared/physics/statistics/spacings'
import { EngineInputError } from '../../../../shared/physics/errors'
import type { EquilibriumMeasure } from '../../../../shared/physics/equilibrium/types'

describe('Chebyshev coefficients (Trefethen, Approximation Theory and Approximation Practice, 2013)', () => {
  it('T_3 has the single coefficient a_3 = 1 and t⁴ = (3T₀ + 4T₂ + T₄)/8', () => {
    const a = chebyshevCoefficients(t => 4 * t ** 3 - 3 * t, 6)
    const expected = [0, 0, 0, 1, 0, 0]
    for (let k = 0; k < 6; k++) expect(a[k]).toBeCloseTo(expected[k], 13)
    const b = chebyshevCoefficients(t => t ** 4, 6)
    expect(b[0]).toBeCloseTo(3 / 8, 14)
    expect(b[2]).toBeCloseTo(1 / 2, 14)
    expect(b[4]).toBeCloseTo(1 / 8, 14)
  })

  it('Johansson\'s variance of T_k on [−1, 1] is k/(2β) and ignores constants', () => {
    expect(johanssonVariance(x => 8 * x ** 4 - 8 * x * x + 1 + 7, 2, 0, 1)).toBeCloseTo(4 / 4, 12)
  })
})

describe('integrals against equilibrium measures', () => {
  it('moments of the semicircle, the disk and the ball (closed forms)', () => {
    // semicircle of radius R: ∫ x² = R²/4, ∫ x⁴ = R⁴/8 (Catalan moments)
    const m = semicircleMeasure(1)
    expect(integrateAgainst(m, x => x[0] ** 2)).toBeCloseTo(0.5, 11)
    expect(integrateAgainst(m, x => x[0] ** 4)).toBeCloseTo(0.5, 11)
    // uniform disk radius 1: ∫ |x|² = 1/2; ball radius 1: ∫ |x|² = 3/5
    expect(integrateAgainst(uniformDiskMeasure(1), x => x[0] ** 2 + x[1] ** 2)).toBeCloseTo(0.5, 12)
    expect(integrateAgainst(uniformBallMeasure(1), x => x[0] ** 2 + x[1] ** 2 + x[2] ** 2)).toBeCloseTo(0.6, 12)
  })

  it('the semicircle CDF is the closed form and the numerical path agrees with it', () => {
    const m = semicircleMeasure(2)
    const F = equilibriumCdf(m)
    const numerical: EquilibriumMeasure = { ...m, method: 'numerical' }
    const G = equilibriumCdf(numerical)
    for (const x of [-0.9, -0.2, 0, 0.5, 0.99]) expect(G(x)).toBeCloseTo(F(x), 9)
    expect(F(0)).toBeCloseTo(0.5, 15)
    expect(F(1)).toBe(1)
  })

  it('unfolded spacings of the quantiles F⁻¹((k − ½)/N) are all exactly 1', () => {
    const m = semicircleMeasure(1)
    const F = equilibriumCdf(m)
    const N = 50
    const x = new Float64Array(N)
    for (let k = 0; k < N; k++) {
      let lo = -Math.SQRT2
      let hi = Math.SQRT2
      for (let it = 0; it < 200; it++) {
        const mid = (lo + hi) / 2
        if (F(mid) < (k + 0.5) / N) lo = mid
        else hi = mid
      }
      x[k] = (lo + hi) / 2
    }
    const s = unfoldedSpacings({ N, d: 1, points: x }, F, 0.5)
    expect(s.length).toBeGreaterThan(20)
    for (const v of s) expect(v).toBeCloseTo(1, 9)
  })

  it('a linear statistic needs a measure or a mean, and names a non-finite value', () => {
    const c = { N: 2, d: 1, points: Float64Array.from([0.5, -1]) }
    expect(() => linearStatistic([c], { f: x => x[0], label: 'x', uniform: Math.random })).toThrow(EngineInputError)
    const t = linearStatistic([c], { f: x => x[0], label: 'x', mean: 0.25, uniform: Math.random })
    expect(t.rows[0].value).toBeCloseTo(-0.5 - 0.5, 14)
    expect(() => linearStatistic([c], { f: x => 1 / (x[0] + 1), label: '1/(x+1)', mean: 0, uniform: Math.random })).toThrow(/point 1 of configuration 0/)
  })
})
