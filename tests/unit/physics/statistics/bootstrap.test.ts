// The bootstrap over configurations (Efron & Tibshirani, An Introduction to the Bootstrap, 1993) and the
// normal distribution helpers (Abramowitz & Stegun 1964, ch. 7 and 26).
import { describe, it, expect } from 'vitest'
import { bootstrap, normalCdf, normalQuantile, quantileSorted } from '../../../../shared/physics/statistics/bootstrap'
import { pooledHistogram, uniformEdges } from '../../../../shared/physics/statistics/histogram'
import { EngineInputError } from '../../../../shared/physics/errors'
import { createTestRng } from '../../../support/stat-samples'

describe('normal distribution', () => {
  it('Φ⁻¹(0.975) = 1.959963984540054 and Φ⁻¹(0.8413447460685429) = 1 (standard tables; common practice)', () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 12)
    expect(normalQuantile(normalCdf(1))).toBeCloseTo(1, 12)
    expect(normalCdf(1)).toBeCloseTo(0.8413447460685429, 14) // A&S Table 26.1
  })

  it('Φ(x) + Φ(−x) = 1 and the tails match the continued fraction region (x = 5: 2.866515718791939e−7, A&S Table 26.1)', () => {
    for (const x of [0.3, 2.9, 4.3, 6]) expect(normalCdf(x) + normalCdf(-x)).toBeCloseTo(1, 14)
    expect(normalCdf(-5) / 2.866515718791939e-7).toBeCloseTo(1, 10)
  })

  it('Φ agrees with the integral of the density (Gauss–Legendre-free check: midpoint rule with 2e5 steps)', () => {
    let s = 0
    const h = 1e-5
    for (let k = 0; k < 200000; k++) {
      const t = (k + 0.5) * h
      s += Math.exp(-t * t / 2) * h
    }
    expect(0.5 + s / Math.sqrt(2 * Math.PI)).toBeCloseTo(normalCdf(2), 10)
  })

  it('refuses p outside (0, 1)', () => {
    expect(() => normalQuantile(0)).toThrow(EngineInputError)
    expect(() => normalQuantile(1.2)).toThrow(/\(0, 1\)/)
  })
})

describe('bootstrap', () => {
  it('the bootstrap standard error of a mean approaches the plug-in value √(Σ(x − x̄)²)/M (Efron & Tibshirani 1993, eq. 5.12)', () => {
    const rng = createTestRng(1)
    const M = 50
    const x = Float64Array.from({ length: M }, () => rng.normal() * 3 + 1)
    const r = bootstrap(M, (w) => {
      let s = 0
      for (let m = 0; m < M; m++) s += w[m] * x[m]
      return [s / M]
    }, { uniform: rng.uniform, replicates: 4000 })
    const mean = x.reduce((a, b) => a + b, 0) / M
    const plugIn = Math.sqrt(x.reduce((a, b) => a + (b - mean) ** 2, 0)) / M
    expect(r.estimate[0]).toBeCloseTo(mean, 14)
    // Monte Carlo error of a standard deviation from B = 4000 replicates: about 1/√(2B) ≈ 1.1 %
    expect(Math.abs(r.error[0] / plugIn - 1)).toBeLessThan(0.05)
    // standard-error interval: estimate ± 1 se by default (level 0.6827)
    expect(r.upper[0] - r.estimate[0]).toBeCloseTo(r.error[0], 8)
  })

  it('percentile intervals bracket the estimate and have the requested coverage width for a normal statistic', () => {
    const rng = createTestRng(2)
    const M = 200
    const x = Float64Array.from({ length: M }, () => rng.normal())
    const r = bootstrap(M, (w) => {
      let s = 0
      for (let m = 0; m < M; m++) s += w[m] * x[m]
      return [s / M]
    }, { uniform: rng.uniform, replicates: 2000, method: 'percentile', level: 0.95 })
    expect(r.lower[0]).toBeLessThan(r.estimate[0])
    expect(r.upper[0]).toBeGreaterThan(r.estimate[0])
    // for a nearly normal bootstrap distribution the 95 % width is ≈ 2·1.96 se
    expect((r.upper[0] - r.lower[0]) / (2 * 1.959963984540054 * r.error[0])).toBeGreaterThan(0.9)
    expect((r.upper[0] - r.lower[0]) / (2 * 1.959963984540054 * r.error[0])).toBeLessThan(1.1)
  })

  it('is deterministic for a seeded uniform() and gives NaN error bars for one configuration', () => {
    const stat = (w: Float64Array) => [w[0] * 2 + w[1]]
    const a = bootstrap(3, stat, { uniform: createTestRng(5).uniform })
    const b = bootstrap(3, stat, { uniform: createTestRng(5).uniform })
    expect(Array.from(a.error)).toEqual(Array.from(b.error))
    const one = bootstrap(1, () => [4], { uniform: Math.random })
    expect(one.estimate[0]).toBe(4)
    expect(Number.isNaN(one.error[0])).toBe(true)
  })

  it('refuses bad input and a bad uniform()', () => {
    expect(() => bootstrap(0, () => [1], { uniform: Math.random })).toThrow(/configurations/)
    expect(() => bootstrap(3, () => [1], { uniform: () => 1 })).toThrow(/\[0, 1\)/)
    expect(() => bootstrap(3, () => [1], { uniform: Math.random, replicates: 1 })).toThrow(/replicates/)
  })

  it('quantiles interpolate between order statistics', () => {
    expect(quantileSorted([1, 2, 3, 4], 0.5)).toBe(2.5)
    expect(quantileSorted([1, 2, 3, 4], 1)).toBe(4)
  })
})

describe('pooled histogram', () => {
  it('integrates to the fraction of values in range and pools configurations by their counts', () => {
    const edges = uniformEdges(0, 1, 4)
    const h = pooledHistogram([[0.1, 0.2, 0.9], [0.6, 1.5]], edges, { uniform: createTestRng(3).uniform })
    expect(Array.from(h.counts)).toEqual([2, 0, 1, 1])
    const mass = h.density.estimate.reduce((s, v) => s + v * 0.25, 0)
    expect(mass).toBeCloseTo(4 / 5, 14)
  })
})
