import { describe, it, expect } from 'vitest'
import { surmiseCurve, wignerSurmise, type SurmiseBeta } from '../../../shared/figures/wigner'
import { integrateAdaptive } from '../../../shared/physics/quadrature'

describe('Wigner surmise', () => {
  it('p₂(1) = (32/π²) e^{−4/π}', () => {
    // Mehta, Random Matrices (2004), p₂(s) = (32/π²) s² e^{−4s²/π} at s = 1.
    expect(wignerSurmise(2, 1)).toBeCloseTo((32 / Math.PI ** 2) * Math.exp(-4 / Math.PI), 15)
  })

  it('p₁ and p₄ at s = 1 follow their formulas', () => {
    // Mehta 2004: p₁(s) = (π/2) s e^{−πs²/4}, p₄(s) = (2¹⁸/(3⁶π³)) s⁴ e^{−64s²/(9π)}.
    expect(wignerSurmise(1, 1)).toBeCloseTo((Math.PI / 2) * Math.exp(-Math.PI / 4), 15)
    expect(wignerSurmise(4, 1)).toBeCloseTo((262144 / (729 * Math.PI ** 3)) * Math.exp(-64 / (9 * Math.PI)), 15)
  })

  it('each surmise is a probability density with mean spacing 1', () => {
    // The surmise is normalised to ∫p = 1 and ∫s p = 1 (Mehta 2004); checked by quadrature.
    for (const beta of [1, 2, 4] as SurmiseBeta[]) {
      const mass = integrateAdaptive(s => wignerSurmise(beta, s), 0, 12).value
      const mean = integrateAdaptive(s => s * wignerSurmise(beta, s), 0, 12).value
      expect(mass).toBeCloseTo(1, 10)
      expect(mean).toBeCloseTo(1, 10)
    }
  })

  it('samples the curve on an even grid from 0', () => {
    const c = surmiseCurve(2, 3, 121)
    expect(c).toHaveLength(121)
    expect(c[0]).toEqual({ s: 0, p: 0 })
    expect(c[40].s).toBe(1)
    expect(() => surmiseCurve(2, 0)).toThrow(/empty/)
  })
})
