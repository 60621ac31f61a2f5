import { describe, it, expect } from 'vitest'
import { betaHermiteEigenvalues, betaLaguerreEigenvalues, sampleBetaHermite, sampleBetaLaguerre } from '../../../shared/physics/samplers/beta-ensembles'
import { ginibreEigenvalues, sampleGinibre } from '../../../shared/physics/samplers/ginibre'
import { createRng } from '../../../shared/physics/random'
import { energy } from '../../../shared/physics/energy'
import { quadraticPotential } from '../../../shared/physics/potentials/presets'
import { parsePotential } from '../../../shared/physics/potentials/expression'
import { ENGINE_VERSION } from '../../../shared/physics/version'
import { EngineInputError } from '../../../shared/physics/errors'

function meanAndError(values: number[]): { mean: number, se: number } {
  const n = values.length
  const mean = values.reduce((s, v) => s + v, 0) / n
  const v = values.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1)
  return { mean, se: Math.sqrt(v / n) }
}

describe('β-Hermite sampler', () => {
  it('is reproducible, sorted, scaled by 1/√(βNa) and labelled', () => {
    const a = sampleBetaHermite({ N: 10, beta: 1.3, a: 2 }, createRng(5))
    const b = sampleBetaHermite({ N: 10, beta: 1.3, a: 2 }, createRng(5))
    expect(Array.from(a.configuration.points)).toEqual(Array.from(b.configuration.points))
    expect(a.scale).toBeCloseTo(1 / Math.sqrt(1.3 * 10 * 2), 15)
    for (let k = 1; k < 10; k++) expect(a.eigenvalues[k]).toBeGreaterThanOrEqual(a.eigenvalues[k - 1])
    expect(a.configuration.points[3]).toBeCloseTo(a.eigenvalues[3] * a.scale, 15)
    expect(a.engineVersion).toBe(ENGINE_VERSION)
    expect(a.potential).toEqual({ text: 'a*x^2', parameters: { a: 2 } })
  })

  it('has E Σλ² = N + βN(N−1)/2 (Dumitriu & Edelman 2002: E tr H² = Σ E T_kk²/2 + Σ E χ²_{(N−k)β})', () => {
    // tr H² = Σ_k h_kk² + 2 Σ_k h_{k,k+1}², h_kk ~ N(0,1), h_{k,k+1}² ~ χ²_{(N−k)β}/2 ⇒ N + βN(N−1)/2
    const rng = createRng('hermite-moment')
    for (const [N, beta] of [[5, 0.7], [4, 3]] as const) {
      const vals: number[] = []
      for (let m = 0; m < 20000; m++) {
        const ev = betaHermiteEigenvalues(N, beta, rng)
        vals.push(ev.reduce((s, x) => s + x * x, 0))
      }
      const { mean, se } = meanAndError(vals)
      expect(Math.abs(mean - (N + (beta * N * (N - 1)) / 2))).toBeLessThan(4.5 * se)
    }
  })

  it('refuses bad β and N', () => {
    expect(() => sampleBetaHermite({ N: 0, beta: 2 }, createRng(1))).toThrow(EngineInputError)
    expect(() => sampleBetaHermite({ N: 3, beta: -1 }, createRng(1))).toThrow(/β/)
    expect(() => sampleBetaHermite({ N: 3, beta: 2, a: 0 }, createRng(1))).toThrow(/a must/)
  })

  it('N = 1 gives a Gaussian of variance 1/(βNa) in the canonical scaling', () => {
    // with one point the canonical weight is e^{−(β/2)·a x²}: variance 1/(βa)
    const rng = createRng(8)
    const xs: number[] = []
    for (let m = 0; m < 20000; m++) xs.push(sampleBetaHermite({ N: 1, beta: 3, a: 0.5 }, rng).configuration.points[0] ** 2)
    const { mean, se } = meanAndError(xs)
    expect(Math.abs(mean - 1 / 1.5)).toBeLessThan(4.5 * se)
  })
})

describe('β-Laguerre sampler', () => {
  it('gives positive eigenvalues with E Σλ = 2αN (sum of the χ² means of the bidiagonal entries)', () => {
    const rng = createRng('lag')
    const N = 6
    const beta = 1.5
    const alpha = 7
    const sums: number[] = []
    for (let m = 0; m < 10000; m++) {
      const ev = betaLaguerreEigenvalues(N, beta, alpha, rng)
      expect(ev[0]).toBeGreaterThan(0)
      sums.push(ev.reduce((s, x) => s + x, 0))
    }
    const { mean, se } = meanAndError(sums)
    expect(Math.abs(mean - 2 * alpha * N)).toBeLessThan(4.5 * se)
  })

  it('matches the complex Wishart moment E tr W² = σ⁴ mn(m + n) at β = 2, α = n (Wick/Isserlis pairings)', () => {
    // W = G*G with G an n×m matrix of complex Gaussians, E|g|² = σ² = 2 (so that the weight is e^{−λ/2});
    // the two Wick pairings of E Σ ḡ_ki g_kj ḡ_lj g_li give σ⁴(m n² + m² n)
    const rng = createRng('wishart')
    const m = 4
    const n = 7
    const vals: number[] = []
    for (let k = 0; k < 20000; k++) vals.push(betaLaguerreEigenvalues(m, 2, n, rng).reduce((s, x) => s + x * x, 0))
    const { mean, se } = meanAndError(vals)
    expect(Math.abs(mean - 4 * m * n * (m + n))).toBeLessThan(4.5 * se)
  })

  it('states a potential the expression parser reads, finite at every sampled point', () => {
    const s = sampleBetaLaguerre({ N: 8, beta: 2, alpha: 12 }, createRng(2))
    const V = parsePotential(s.potential.text, { d: 1, parameters: s.potential.parameters })
    // k = 2(α − p)/(βN), p = 1 + β(N − 1)/2 = 8 ⇒ k = 2·4/16
    expect(s.potential.parameters.k).toBeCloseTo(0.5, 15)
    const e = energy(s.configuration, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: V })
    expect(Number.isFinite(e.H)).toBe(true)
  })

  it('refuses α ≤ β(N − 1)/2', () => {
    expect(() => sampleBetaLaguerre({ N: 5, beta: 2, alpha: 4 }, createRng(1))).toThrow(/exceed/)
  })
})

describe('Ginibre sampler', () => {
  it('is reproducible and scaled by 1/√N into the canonical plasma with V = |x|²', () => {
    const a = sampleGinibre({ N: 30 }, createRng(3))
    const b = sampleGinibre({ N: 30 }, createRng(3))
    expect(Array.from(a.configuration.points)).toEqual(Array.from(b.configuration.points))
    expect(a.configuration.d).toBe(2)
    expect(a.beta).toBe(2)
    const e = energy(a.configuration, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadraticPotential(1, 2) })
    expect(Number.isFinite(e.H)).toBe(true)
  })

  it('has E Σ|z|² = N(N+1)/2 for the unscaled eigenvalues (Kostlan: Σ_k E Gamma(k, 1) = Σ_k k)', () => {
    // Kostlan, Linear Algebra Appl. 162–164 (1992): {|z|²} has the law of independent Gamma(k, 1), k = 1 … N
    const rng = createRng('gin2')
    const N = 5
    const vals: number[] = []
    for (let m = 0; m < 8000; m++) {
      const ev = ginibreEigenvalues(N, rng)
      let s = 0
      for (let k = 0; k < N; k++) s += ev.re[k] ** 2 + ev.im[k] ** 2
      vals.push(s)
    }
    const { mean, se } = meanAndError(vals)
    expect(Math.abs(mean - (N * (N + 1)) / 2)).toBeLessThan(4.5 * se)
  })
})
