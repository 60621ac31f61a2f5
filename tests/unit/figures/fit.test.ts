import { describe, it, expect } from 'vitest'
import { evaluateExpansion, fitEnergyExpansion, leastSquares } from '../../../shared/figures/fit'
import { EngineInputError } from '../../../shared/physics/errors'

describe('least squares by Householder QR', () => {
  it('recovers the coefficients of an exactly linear model', () => {
    // y = 2 − 3x + 0.5x², sampled without noise: the residual is zero, the solution exact.
    const xs = [0, 0.5, 1, 1.5, 2, 3, 4]
    const cols = [Float64Array.from(xs, () => 1), Float64Array.from(xs), Float64Array.from(xs, x => x * x)]
    const y = xs.map(x => 2 - 3 * x + 0.5 * x * x)
    const beta = leastSquares(cols, y)
    expect(beta[0]).toBeCloseTo(2, 12)
    expect(beta[1]).toBeCloseTo(-3, 12)
    expect(beta[2]).toBeCloseTo(0.5, 12)
  })

  it('matches the closed-form straight-line fit on noisy data', () => {
    // Closed form for y ≈ α + βx: β = Sxy/Sxx, α = ȳ − βx̄ (common practice).
    const xs = [1, 2, 3, 4, 5, 6]
    const y = [1.1, 1.9, 3.2, 3.9, 5.1, 6.2]
    const mx = xs.reduce((a, b) => a + b) / xs.length
    const my = y.reduce((a, b) => a + b) / y.length
    let sxy = 0
    let sxx = 0
    xs.forEach((x, i) => {
      sxy += (x - mx) * (y[i] - my)
      sxx += (x - mx) * (x - mx)
    })
    const slope = sxy / sxx
    const beta = leastSquares([Float64Array.from(xs, () => 1), Float64Array.from(xs)], y)
    expect(beta[1]).toBeCloseTo(slope, 12)
    expect(beta[0]).toBeCloseTo(my - slope * mx, 12)
  })

  it('weights scale the squared residuals', () => {
    // Two inconsistent values of a constant: the weighted fit is the weighted mean.
    const beta = leastSquares([Float64Array.from([1, 1])], [1, 4], [3, 1])
    expect(beta[0]).toBeCloseTo((3 * 1 + 1 * 4) / 4, 14)
  })

  it('refuses a rank-deficient design and a bad weight', () => {
    const c = Float64Array.from([1, 2, 3])
    expect(() => leastSquares([c, Float64Array.from(c, v => 2 * v)], [1, 2, 3])).toThrow(EngineInputError)
    expect(() => leastSquares([c], [1, 2, 3], [1, 0, 1])).toThrow(/weight/)
  })
})

describe('fit of a + b·log N/N + c/N', () => {
  it('recovers known coefficients from synthetic exact data to 1e-10', () => {
    const a = -0.3749
    const b = 0.25
    const c = -1.7
    const Ns = [8, 16, 32, 64, 128, 256, 512, 1024, 4096]
    const e = Ns.map(N => a + (b * Math.log(N)) / N + c / N)
    const fit = fitEnergyExpansion(Ns, e)
    expect(Math.abs(fit.a - a)).toBeLessThan(1e-10)
    expect(Math.abs(fit.b - b)).toBeLessThan(1e-10)
    expect(Math.abs(fit.c - c)).toBeLessThan(1e-10)
    expect(fit.residualRms).toBeLessThan(1e-12)
    expect(evaluateExpansion(fit, 100)).toBeCloseTo(a + (b * Math.log(100)) / 100 + c / 100, 12)
  })

  it('needs three distinct N and positive N', () => {
    expect(() => fitEnergyExpansion([10, 10, 20], [1, 1, 1])).toThrow(/three distinct/)
    expect(() => fitEnergyExpansion([10, -1, 20], [1, 1, 1])).toThrow(EngineInputError)
  })
})
