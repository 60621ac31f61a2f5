// log Γ, ψ, the exact partition functions in other convention records, the mean energy as −2 d/dβ log Z,
// thermodynamic integration (exact and noisy means) and the argument checks.
import { describe, it, expect } from 'vitest'
import { integrateAdaptive } from '../../../shared/physics/quadrature'
import { digamma, logFactorial, logGamma } from '../../../shared/physics/partition/log-gamma'
import { exactLogZ, gaussianLogZ, gaussianMeanEnergy, ginibreLogZ } from '../../../shared/physics/partition/exact'
import { thermodynamicIntegration } from '../../../shared/physics/partition/thermodynamic-integration'
import { EngineInputError } from '../../../shared/physics/errors'
import type { EnergyConvention } from '../../../shared/physics/conventions'
import { createTestRng } from '../../support/stat-samples'

describe('log Γ and ψ', () => {
  it('log Γ(n) = log (n − 1)! and Γ(½) = √π (common practice) to 1e−14', () => {
    let f = 1
    for (let n = 1; n <= 25; n++) {
      if (n > 1) f *= n - 1
      expect(Math.abs(logGamma(n) - Math.log(f))).toBeLessThan(1e-14 * Math.max(1, Math.log(f)))
    }
    expect(Math.abs(logGamma(0.5) - 0.5 * Math.log(Math.PI))).toBeLessThan(1e-14)
    expect(Math.abs(logGamma(1.5) - Math.log(Math.sqrt(Math.PI) / 2))).toBeLessThan(1e-14)
  })

  it('the recurrence log Γ(x + 1) = log Γ(x) + log x holds across the shift threshold and for small x', () => {
    for (const x of [1e-6, 0.013, 0.77, 3.3, 15.2, 15.99, 16, 40.1, 1e4]) {
      // rounding: 1e−14 relative to the size of log Γ (about 8e4 at x = 1e4)
      expect(Math.abs(logGamma(x + 1) - logGamma(x) - Math.log(x))).toBeLessThan(1e-14 * Math.max(1, Math.abs(logGamma(x + 1))))
    }
  })

  it('ψ(1) = −γ, ψ(½) = −γ − 2 log 2 (A&S 6.3.2, 6.3.3; γ = 0.5772156649015329) and ψ = (log Γ)\'', () => {
    const gamma = 0.5772156649015329
    expect(digamma(1)).toBeCloseTo(-gamma, 14)
    expect(digamma(0.5)).toBeCloseTo(-gamma - 2 * Math.log(2), 14)
    for (const x of [0.3, 2.5, 17, 120]) {
      const h = 1e-4
      // fourth-order central difference
      const fd = (-logGamma(x + 2 * h) + 8 * logGamma(x + h) - 8 * logGamma(x - h) + logGamma(x - 2 * h)) / (12 * h)
      expect(digamma(x)).toBeCloseTo(fd, 8)
    }
  })

  it('log n! and bad arguments', () => {
    expect(logFactorial(0)).toBe(0)
    expect(logFactorial(10)).toBeCloseTo(Math.log(3628800), 14)
    expect(logFactorial(30)).toBeCloseTo(logGamma(31), 12)
    expect(() => logGamma(0)).toThrow(EngineInputError)
    expect(() => logFactorial(2.5)).toThrow(/integer/)
  })
})

describe('exact log Z in convention records (conventions.ts)', () => {
  const N = 7
  const beta = 1.5
  const a = 0.8
  it('½Σ, (N/2)ΣV, e^{−βH} is the canonical Gibbs measure: same log Z', () => {
    const conv: EnergyConvention = { pairs: 'half', fieldScale: 'N/2', logSign: 'minus-log', gibbs: 'beta' }
    const r = exactLogZ({ ensemble: 'gaussian', N, beta, a, convention: conv })
    expect(r.logZ).toBeCloseTo(gaussianLogZ(N, beta, a), 12)
    expect(r.canonical.beta).toBeCloseTo(beta, 14)
    expect(r.engineVersion).toMatch(/\d/)
  })

  it('½Σ, ΣV, e^{−βH}: weight Π|Δ|^β e^{−βΣ a x²} is canonical with a\' = 2a/N', () => {
    const conv: EnergyConvention = { pairs: 'half', fieldScale: 1, logSign: 'plus-log', gibbs: 'beta' }
    const r = exactLogZ({ ensemble: 'gaussian', N, beta, a, convention: conv })
    expect(r.logZ).toBeCloseTo(gaussianLogZ(N, beta, (2 * a) / N), 12)
    expect(r.canonical.a).toBeCloseTo((2 * a) / N, 14)
  })

  it('Σ, NΣV, e^{−βN^{2/d−1}H/2} in d = 1: weight Π|Δ|^{βN} e^{−(βN/2) N Σ V} is canonical β\' = βN', () => {
    const conv: EnergyConvention = { pairs: 'full', fieldScale: 'N', logSign: 'minus-log', gibbs: 'beta N^(2/d-1)/2' }
    expect(exactLogZ({ ensemble: 'gaussian', N, beta, a, convention: conv }).logZ).toBeCloseTo(gaussianLogZ(N, beta * N, a), 10)
    // in d = 2 the factor N^{2/d−1} is 1: β = 2 stays the Ginibre case
    expect(exactLogZ({ ensemble: 'ginibre', N, beta: 2, a, convention: conv }).logZ).toBeCloseTo(ginibreLogZ(N, a), 12)
  })
})

describe('mean energy and thermodynamic integration', () => {
  it('E_β[H] = −2 d/dβ log Z (finite differences) and, at N = 2, a direct quadrature of H e^{−βH/2}', () => {
    for (const [N, beta, a] of [[2, 2, 1], [5, 0.7, 2], [30, 4, 1]]) {
      const h = 1e-4
      const fd = -2 * (-gaussianLogZ(N, beta + 2 * h, a) + 8 * gaussianLogZ(N, beta + h, a) - 8 * gaussianLogZ(N, beta - h, a) + gaussianLogZ(N, beta - 2 * h, a)) / (12 * h)
      expect(gaussianMeanEnergy(N, beta, a) / fd).toBeCloseTo(1, 8)
    }
    // N = 2, β = 2, a = 1: H = −2 log|x − y| + 2(x² + y²); in u = (x − y)/√2, v = (x + y)/√2,
    // H = −2 log(√2|u|) + 2(u² + v²) and e^{−H} = 2u² e^{−2u² − 2v²}
    const w = (u: number, v: number): number => 2 * u * u * Math.exp(-2 * u * u - 2 * v * v)
    const H = (u: number, v: number): number => -2 * Math.log(Math.SQRT2 * Math.abs(u)) + 2 * (u * u + v * v)
    const Z = integrateAdaptive(u => integrateAdaptive(v => w(u, v), -8, 8).value, -8, 8, { breakpoints: [0] }).value
    const EH = integrateAdaptive(u => integrateAdaptive(v => (u === 0 ? 0 : H(u, v) * w(u, v)), -8, 8).value, -8, 8, { breakpoints: [0] }).value / Z
    expect(gaussianMeanEnergy(2, 2, 1)).toBeCloseTo(EH, 9)
  })

  it('reproduces log Z(β₁) − log Z(β₀) of the Gaussian ensemble from the exact E_β[H]', () => {
    const N = 20
    const exact = (b: number) => ({ mean: gaussianMeanEnergy(N, b, 1), stderr: 0 })
    const target = gaussianLogZ(N, 4, 1) - gaussianLogZ(N, 0.5, 1)
    const r = thermodynamicIntegration(exact, 0.5, 4, { nodes: 16, estimateQuadratureError: true })
    expect(Math.abs(r.difference - target)).toBeLessThan(1e-11 * Math.abs(target))
    expect(r.error).toBe(0)
    // halving the nodes gives a conservative estimate: larger than the true error, still small
    expect(r.quadratureError).toBeGreaterThan(Math.abs(r.difference - target))
    expect(r.quadratureError).toBeLessThan(1e-3)
    const logged = thermodynamicIntegration(exact, 0.1, 10, { nodes: 16, variable: 'log-beta', panels: 2 })
    expect(logged.difference).toBeCloseTo(gaussianLogZ(N, 10, 1) - gaussianLogZ(N, 0.1, 1), 8)
    // and the reversed range gives the negative
    expect(thermodynamicIntegration(exact, 4, 0.5, { nodes: 16 }).difference).toBeCloseTo(-r.difference, 12)
  })

  it('with noisy means the error bar is ½(Σ w_i² σ_i²)^{1/2} and covers the exact difference', () => {
    const N = 10
    const rng = createTestRng(71)
    const sigma = (b: number) => 0.5 + b
    const target = gaussianLogZ(N, 3, 1) - gaussianLogZ(N, 1, 1)
    let inside = 0
    const runs = 200
    let last = { error: 0, points: [] as Array<{ weight: number, stderr: number }> }
    for (let k = 0; k < runs; k++) {
      const r = thermodynamicIntegration(b => ({ mean: gaussianMeanEnergy(N, b, 1) + sigma(b) * rng.normal(), stderr: sigma(b) }), 1, 3, { nodes: 8 })
      if (Math.abs(r.difference - target) <= 2 * r.error) inside++
      last = r
    }
    const propagated = 0.5 * Math.sqrt(last.points.reduce((s, p) => s + (p.weight * p.stderr) ** 2, 0))
    expect(last.error).toBeCloseTo(propagated, 14)
    // 2σ coverage 95.4 %: of 200 runs, between 180 and 198 is a 3-sd range of the binomial count
    expect(inside).toBeGreaterThan(180)
    expect(inside).toBeLessThan(199)
  })

  it('names the node of a bad estimate', () => {
    expect(() => thermodynamicIntegration(() => ({ mean: Number.NaN, stderr: 0 }), 1, 2)).toThrow(/node 0/)
    expect(() => thermodynamicIntegration(() => ({ mean: 1, stderr: -1 }), 1, 2)).toThrow(EngineInputError)
    expect(() => thermodynamicIntegration(() => ({ mean: 1, stderr: 0 }), 0, 2, { variable: 'log-beta' })).toThrow(/> 0/)
  })
})
