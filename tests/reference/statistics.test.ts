// Statistics of point ensembles against published laws, on seeded samples built in tests/support.
// Tolerances: |estimate − reference| ≤ 4 bootstrap standard errors (common practice), plus a stated
// allowance where the reference is itself an approximation.
import { describe, it, expect } from 'vitest'
import { semicircleMeasure, uniformDiskMeasure } from '../../shared/physics/equilibrium/closed-forms'
import { integrateAdaptive } from '../../shared/physics/quadrature'
import type { Configuration } from '../../shared/physics/types'
import { pooledHistogram, uniformEdges } from '../../shared/physics/statistics/histogram'
import { linearStatistic, johanssonVariance } from '../../shared/physics/statistics/linear-statistics'
import { ginibreNumberVariance, numberVariance, scaledBesselI } from '../../shared/physics/statistics/number-variance'
import { pairCorrelation } from '../../shared/physics/statistics/pair-correlation'
import { spacingDistribution, wignerSurmise } from '../../shared/physics/statistics/spacings'
import { torusStructureFactor } from '../../shared/physics/statistics/structure-factor'
import { empiricalDensity } from '../../shared/physics/statistics/density'
import { nearestNeighbourDistribution } from '../../shared/physics/statistics/nearest-neighbour'
import { betaHermite, createTestRng, ginibreEigenvalues, poissonBall, poissonBox, spacing2x2, toCanonicalLine } from '../support/stat-samples'

const line = (points: Float64Array): Configuration => ({ N: points.length, d: 1, points })
const planar = (points: Float64Array, d = 2): Configuration => ({ N: points.length / d, d, points })

describe('Wigner surmise (Mehta, Random Matrices, 2004, §1.5)', () => {
  for (const beta of [1, 2, 4] as const) {
    it(`p_${beta} has mass 1 and mean 1 (adaptive quadrature on [0, 12]; the tail beyond is below 1e−40)`, () => {
      const mass = integrateAdaptive(s => wignerSurmise(beta, s), 0, 12).value
      const mean = integrateAdaptive(s => s * wignerSurmise(beta, s), 0, 12).value
      expect(mass).toBeCloseTo(1, 12)
      expect(mean).toBeCloseTo(1, 12)
    })
  }

  it('p₂ has the second moment 3π/8 of the χ₃ law scaled to mean 1 (derived)', () => {
    // p₂ ∝ s² e^{−cs²} is a scaled χ₃ law: E χ₃ = 2√(2/π), E χ₃² = 3, so E s² = 3/(E χ₃)² = 3π/8
    const m2 = integrateAdaptive(s => s * s * wignerSurmise(2, s), 0, 12).value
    expect(m2).toBeCloseTo((3 * Math.PI) / 8, 12)
  })

  for (const beta of [1, 2, 4] as const) {
    it(`2×2 samples of symmetry class β = ${beta} follow p_${beta} exactly (binomial error bars)`, () => {
      const rng = createTestRng(100 + beta)
      const n = 20000
      const s = Float64Array.from({ length: n }, () => spacing2x2(beta, rng))
      const mean = s.reduce((a, b) => a + b, 0) / n
      const scaled = s.map(v => v / mean)
      const edges = uniformEdges(0, 3, 12)
      const hist = pooledHistogram([scaled], edges, { uniform: rng.uniform })
      for (let b = 0; b < 12; b++) {
        const P = integrateAdaptive(x => wignerSurmise(beta, x), edges[b], edges[b + 1]).value
        const sd = Math.sqrt(n * P * (1 - P))
        expect(Math.abs(hist.counts[b] - n * P)).toBeLessThan(4.5 * sd + 1)
      }
    })
  }
})

describe('spacings of the Gaussian unitary ensemble (β-Hermite model, Dumitriu & Edelman 2002)', () => {
  it('bulk spacings unfolded through the semicircle follow the Wigner surmise p₂ within error bars', () => {
    const rng = createTestRng(7)
    const configs = Array.from({ length: 40 }, () => line(toCanonicalLine(betaHermite(200, 2, rng), 2, 1)))
    const table = spacingDistribution(configs, { measure: semicircleMeasure(1), bins: 16, smax: 3.2, beta: 2, uniform: rng.uniform })
    // The surmise differs from the exact large-N GUE law by less than 0.02 in density
    // (Mehta 2004, §6.4 and Fig. 6.3; value recalled from memory).
    for (const row of table.rows) {
      const exact = integrateAdaptive(x => wignerSurmise(2, x), row.sLow, row.sHigh).value / (row.sHigh - row.sLow)
      expect(Math.abs(row.density - exact)).toBeLessThan(4 * row.error + 0.02)
    }
    expect(Math.abs(table.summary.meanSpacing - 1)).toBeLessThan(4 * table.summary.meanSpacingError + 0.01)
    expect(table.engineVersion).toMatch(/\d+\.\d+\.\d+/)
  })

  it('the spacings are not Poissonian: the first bin is far below e^{−s} (level repulsion)', () => {
    const rng = createTestRng(8)
    const configs = Array.from({ length: 10 }, () => line(toCanonicalLine(betaHermite(200, 2, rng), 2, 1)))
    const table = spacingDistribution(configs, { measure: semicircleMeasure(1), bins: 20, smax: 4, uniform: rng.uniform })
    // p₂ gives ≈ 0.014 on [0, 0.2]; Poisson spacings e^{−s} would give ≈ 0.9
    expect(table.rows[0].density).toBeLessThan(0.05)
  })

  it('the empirical density matches the semicircle in the bulk (Wigner; Forrester 2010, §1.4)', () => {
    const rng = createTestRng(9)
    const configs = Array.from({ length: 20 }, () => line(toCanonicalLine(betaHermite(200, 2, rng), 2, 1)))
    const table = empiricalDensity(configs, { measure: semicircleMeasure(1), bins: 20, range: [-1.2, 1.2], uniform: rng.uniform })
    for (const row of table.rows) expect(Math.abs(row.density - row.equilibrium)).toBeLessThan(4 * row.error + 0.02)
  })
})

describe('linear statistics of the Gaussian β-ensemble (Johansson, Duke Math. J. 91, 1998)', () => {
  // Exact finite-N values in the canonical convention (weight Π|Δ|^β e^{−(β/2) N a Σ x²}), derived from
  // Mehta's integral: the centre of mass separates, Var Σ x_i = 1/(βa); scaling a gives
  // Var Σ x_i² = (2/(β² N a²))(1 + β(N − 1)/2).
  for (const [beta, a] of [[1, 1], [2, 1], [4, 0.5]] as const) {
    it(`Johansson's limit (1/(2β)) Σ k a_k² equals the exact large-N variances for f = x and x² (β = ${beta}, a = ${a})`, () => {
      const R = Math.sqrt(2 / a)
      expect(johanssonVariance(x => x, beta, 0, R)).toBeCloseTo(1 / (beta * a), 12)
      expect(johanssonVariance(x => x * x, beta, 0, R)).toBeCloseTo(1 / (beta * a * a), 12)
    })
  }

  it('sampled variances of Σ x_i and Σ x_i² agree with the exact finite-N values within error bars', () => {
    const rng = createTestRng(11)
    const N = 40
    const beta = 2
    const configs = Array.from({ length: 400 }, () => line(toCanonicalLine(betaHermite(N, beta, rng), beta, 1)))
    const measure = semicircleMeasure(1)
    const lin = linearStatistic(configs, { f: x => x[0], label: 'x', measure, beta, uniform: rng.uniform })
    expect(Math.abs(lin.summary.variance - 1 / beta)).toBeLessThan(4 * lin.summary.varianceError)
    expect(Math.abs(lin.summary.mean)).toBeLessThan(4 * lin.summary.meanError)
    expect(lin.summary.limitingVariance).toBeCloseTo(1 / beta, 10)
    const quad = linearStatistic(configs, { f: x => x[0] * x[0], label: 'x^2', measure, uniform: rng.uniform })
    // ∫ x² dμ = R²/4 = 1/2 for the semicircle of radius √2 (second moment of the semicircle law)
    expect(quad.summary.integral).toBeCloseTo(0.5, 10)
    const exact = (2 / (beta * beta * N)) * (1 + (beta * (N - 1)) / 2)
    expect(Math.abs(quad.summary.variance - exact)).toBeLessThan(4 * quad.summary.varianceError)
  })
})

describe('Poisson processes (Illian, Penttinen, Stoyan & Stoyan 2008, §2.4, §4.3)', () => {
  it('g(r) = 1 in a disk window with Ripley\'s isotropic correction and with minus sampling', () => {
    const rng = createTestRng(21)
    const configs = Array.from({ length: 30 }, () => planar(poissonBall(100, 1, 2, rng)))
    for (const edge of ['ripley', 'reduced-sample'] as const) {
      const t = pairCorrelation(configs, { window: { kind: 'ball', center: [0, 0], radius: 1 }, rmax: 0.5, bins: 10, edge, reference: 'poisson', uniform: rng.uniform })
      for (const row of t.rows) expect(Math.abs(row.g - 1)).toBeLessThan(4 * row.error)
    }
  })

  it('g(r) = 1 on the periodic box in d = 1, 2, 3 and in a ball window in d = 1, 3', () => {
    const rng = createTestRng(23)
    for (const d of [1, 2, 3]) {
      const L = d === 1 ? 100 : d === 2 ? 10 : 5
      const configs = Array.from({ length: 20 }, () => planar(poissonBox(d === 3 ? 2 : 3, L, d, rng), d))
      const t = pairCorrelation(configs, { window: { kind: 'torus', L }, bins: 8, uniform: rng.uniform })
      for (const row of t.rows) expect(Math.abs(row.g - 1)).toBeLessThan(4 * row.error)
    }
    for (const d of [1, 3]) {
      const configs = Array.from({ length: 20 }, () => planar(poissonBall(d === 1 ? 100 : 40, 1.5, d, rng), d))
      const t = pairCorrelation(configs, { window: { kind: 'ball', center: new Array<number>(d).fill(0), radius: 1.5 }, rmax: 0.75, bins: 6, uniform: rng.uniform })
      for (const row of t.rows) expect(Math.abs(row.g - 1)).toBeLessThan(4 * row.error)
    }
  })

  it('S(k) = 1 at the reciprocal-lattice vectors of the periodic box (d = 2, 3)', () => {
    const rng = createTestRng(24)
    for (const d of [2, 3]) {
      const L = d === 2 ? 10 : 5
      const configs = Array.from({ length: 30 }, () => planar(poissonBox(2, L, d, rng), d))
      const t = torusStructureFactor(configs, { L, nmax: d === 2 ? 8 : 4, uniform: rng.uniform })
      for (const row of t.rows) expect(Math.abs(row.S - 1)).toBeLessThan(4 * row.error)
    }
  })

  it('number variance equals the mean count', () => {
    const rng = createTestRng(25)
    const configs = Array.from({ length: 100 }, () => planar(poissonBox(2, 10, 2, rng)))
    const t = numberVariance(configs, { window: { kind: 'torus', L: 10 }, radii: [0.5, 1, 2], centres: 100, reference: 'poisson', uniform: rng.uniform })
    for (const row of t.rows) {
      expect(Math.abs(row.variance - row.mean)).toBeLessThan(4 * row.error)
      expect(Math.abs(row.mean - 2 * Math.PI * row.r * row.r)).toBeLessThan(4 * row.meanError)
    }
  })

  it('nearest-neighbour distances follow 2πρr e^{−πρr²} on the periodic box', () => {
    const rng = createTestRng(26)
    const configs = Array.from({ length: 20 }, () => planar(poissonBox(2, 10, 2, rng)))
    const t = nearestNeighbourDistribution(configs, { window: { kind: 'torus', L: 10 }, bins: 10, rmax: 1, uniform: rng.uniform })
    for (const row of t.rows) expect(Math.abs(row.density - row.poisson)).toBeLessThan(4 * row.error + 0.03)
  })
})

describe('the 2-D plasma at β = 2 (Ginibre eigenvalues, density 1/π)', () => {
  // Ginibre, J. Math. Phys. 6 (1965). The bulk disk of radius 6 lies well inside the support of
  // radius √80 ≈ 8.9, where the finite-N density differs from 1/π by less than 1e−6.
  const rng = createTestRng(31)
  const configs = Array.from({ length: 30 }, () => planar(ginibreEigenvalues(80, rng)))

  it('g(r) = 1 − exp(−πρr²) in the bulk', () => {
    const t = pairCorrelation(configs, { window: { kind: 'ball', center: [0, 0], radius: 6 }, rmax: 3, bins: 12, reference: 'ginibre', uniform: rng.uniform })
    // the first shell holds almost no pairs (expected g ≈ 0.03), so its bootstrap error is 0: checked apart
    for (const row of t.rows.slice(1)) expect(Math.abs(row.g - row.reference)).toBeLessThan(4 * row.error + 0.01)
    expect(t.rows[0].g).toBeLessThan(0.1)
  })

  it('number variance R² e^{−2R²}[I₀(2R²) + I₁(2R²)] (Shirai 2006, recalled from memory), well below the Poisson value R²', () => {
    const t = numberVariance(configs, { window: { kind: 'ball', center: [0, 0], radius: 6 }, radii: [0.5, 1, 2], centres: 100, uniform: rng.uniform })
    for (const row of t.rows) {
      const ref = ginibreNumberVariance(row.r)
      expect(Math.abs(row.variance - ref)).toBeLessThan(4 * row.error + 0.02)
      if (row.r >= 1) expect(ref).toBeLessThan(0.6 * row.r * row.r)
    }
  })

  it('the scaled Bessel functions match their power series (Abramowitz & Stegun 9.6.10)', () => {
    for (const x of [0.1, 1, 2, 8, 30]) {
      let i0 = 0
      let i1 = 0
      let term = 1
      for (let k = 0; k < 200; k++) {
        if (k > 0) term *= (x / 2) ** 2 / (k * k)
        i0 += term
        i1 += (term * (x / 2)) / (k + 1)
      }
      expect(scaledBesselI(0, x)).toBeCloseTo(Math.exp(-x) * i0, 13)
      expect(scaledBesselI(1, x)).toBeCloseTo(Math.exp(-x) * i1, 13)
    }
  })

  it('the radial density of the scaled sample is the uniform disk law (circular law)', () => {
    const scaled = configs.slice(0, 10).map(c => planar(c.points.map(v => v / Math.sqrt(80))))
    const t = empiricalDensity(scaled, { measure: uniformDiskMeasure(1), bins: 8, range: [0, 0.8], uniform: rng.uniform })
    // ρ_N = N/π at scale 1/√N; as a probability density (1/π)
    for (const row of t.rows) expect(Math.abs(row.density - 1 / Math.PI)).toBeLessThan(4 * row.error + 0.005)
  })
})
