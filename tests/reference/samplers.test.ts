import { describe, it, expect } from 'vitest'
import { betaHermiteEigenvalues, sampleBetaHermite } from '../../shared/physics/samplers/beta-ensembles'
import { ginibreEigenvalues, sampleGinibre } from '../../shared/physics/samplers/ginibre'
import { integratedAutocorrelation, runMcmc } from '../../shared/physics/samplers/mcmc'
import { createRng } from '../../shared/physics/random'
import { semicircleMeasure } from '../../shared/physics/equilibrium/closed-forms'
import { integrateAdaptive } from '../../shared/physics/quadrature'
import { quadraticPotential } from '../../shared/physics/potentials/presets'
import { energy } from '../../shared/physics/energy'

function meanAndError(values: number[]): { mean: number, se: number } {
  const n = values.length
  const mean = values.reduce((s, v) => s + v, 0) / n
  const v = values.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1)
  return { mean, se: Math.sqrt(v / n) }
}

/** Digamma ψ(x), x > 0: recurrence to x ≥ 16, then the asymptotic series (Abramowitz & Stegun 6.3.5, 6.3.18). */
function digamma(x: number): number {
  let acc = 0
  while (x < 16) {
    acc -= 1 / x
    x += 1
  }
  const x2 = 1 / (x * x)
  return acc + Math.log(x) - 0.5 / x - x2 * (1 / 12 - x2 * (1 / 120 - x2 * (1 / 252 - x2 * (1 / 240 - x2 / 132))))
}

/** E[H] of the canonical 1-D log-gas with V = a x² at β: −2 d/dβ log Z, with Z from Mehta's integral
 *  (Mehta, Random Matrices, 3rd ed. 2004) after x = λ/√(βNa):
 *  log Z = −(N/2 + βN(N−1)/4) log(βNa) + Σ_j log Γ(1 + jβ/2) − N log Γ(1 + β/2) + const. */
function gaussianEnsembleMeanEnergy(N: number, beta: number, a: number): number {
  let s = (N * (N - 1) / 4) * Math.log(beta * N * a) + (N / 2 + (beta * N * (N - 1)) / 4) / beta + (N / 2) * digamma(1 + beta / 2)
  for (let j = 1; j <= N; j++) s -= (j / 2) * digamma(1 + (j * beta) / 2)
  return 2 * s
}

/** Catalan numbers (common practice). */
const CATALAN = [1, 1, 2, 5, 14]

describe('semicircle law for the Gaussian β-ensemble (Wigner, Ann. Math. 62, 1955; Anderson, Guionnet & Zeitouni, An Introduction to Random Matrices, 2010, §2.1)', () => {
  it('the digamma helper is right: ψ(1) = −γ, ψ(1/2) = −γ − 2 log 2 (Abramowitz & Stegun 6.3.2, 6.3.3)', () => {
    const gamma = 0.5772156649015329 // Euler's constant (common practice)
    expect(digamma(1)).toBeCloseTo(-gamma, 13)
    expect(digamma(0.5)).toBeCloseTo(-gamma - 2 * Math.log(2), 13)
  })

  it('moments (1/N) E Σ x^{2k} approach C_k (R/2)^{2k} for the semicircle of radius R = √2 (V = x²)', () => {
    // semicircle on [−R, R]: m_{2k} = C_k (R/2)^{2k} (Anderson, Guionnet & Zeitouni 2010, §2.1, rescaled from radius 2)
    const rng = createRng('moments')
    const N = 200
    const M = 30
    for (const beta of [1, 2, 4]) {
      const sums = [0, 0, 0, 0]
      for (let m = 0; m < M; m++) {
        const x = sampleBetaHermite({ N, beta }, rng).configuration.points
        for (const v of x) {
          let p = v * v
          for (let k = 1; k <= 3; k++) {
            sums[k] += p
            p *= v * v
          }
        }
      }
      for (let k = 1; k <= 3; k++) {
        const expected = CATALAN[k] * 0.5 ** k
        // finite-N corrections are O(1/N) for β ≠ 2 (Dumitriu & Edelman 2002): allow a few percent
        expect(Math.abs(sums[k] / (M * N) - expected)).toBeLessThan(0.03 * expected + 2 / N)
      }
    }
  })

  it('the empirical CDF of the points matches the engine semicircle CDF within a DKW band', () => {
    const mu = semicircleMeasure(1)
    const R = Math.SQRT2
    const rng = createRng('cdf')
    const N = 200
    const M = 40
    const pts: number[] = []
    for (let m = 0; m < M; m++) pts.push(...sampleBetaHermite({ N, beta: 2 }, rng).configuration.points)
    pts.sort((a, b) => a - b)
    // Dvoretzky–Kiefer–Wolfowitz (Massart, Ann. Probab. 18, 1990): P(sup|F_n − F| > ε) ≤ 2e^{−2nε²}; level 1e−4,
    // plus an O(1/N) allowance for the finite-N density (repelling points only make the band looser)
    const n = pts.length
    const eps = Math.sqrt(Math.log(2 / 1e-4) / (2 * n)) + 1 / N
    for (const x of [-1.2, -0.7, -0.2, 0, 0.4, 0.9, 1.3]) {
      const F = integrateAdaptive(t => mu.density([t], 0), -R, x).value
      let count = 0
      while (count < n && pts[count] <= x) count++
      expect(Math.abs(count / n - F)).toBeLessThan(eps)
    }
  })

  it('exact samples reproduce E[H] from Mehta\'s integral (N = 3, several β)', () => {
    const rng = createRng('mehta-exact')
    const V = quadraticPotential(1, 1)
    for (const beta of [0.5, 2, 5]) {
      const Hs: number[] = []
      for (let m = 0; m < 20000; m++) {
        const c = sampleBetaHermite({ N: 3, beta }, rng).configuration
        Hs.push(energy(c, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: V }).H)
      }
      const { mean, se } = meanAndError(Hs)
      expect(Math.abs(mean - gaussianEnsembleMeanEnergy(3, beta, 1))).toBeLessThan(4.5 * se)
    }
  })
})

/** E #{k : |z_k|² < t} for Ginibre eigenvalues (unscaled) = Σ_{k=1}^{N} P(Gamma(k, 1) < t) (Kostlan 1992). */
function expectedCountBelow(N: number, t: number): number {
  // P(Gamma(k,1) < t) = P(Poisson(t) ≥ k) = 1 − Σ_{j<k} e^{−t} t^j / j!
  let total = 0
  let term = Math.exp(-t)
  let cdf = 0
  for (let k = 1; k <= N; k++) {
    cdf += term // Σ_{j ≤ k−1}
    total += 1 - cdf
    term *= t / k
  }
  return total
}

describe('Ginibre ensemble (Ginibre, J. Math. Phys. 6, 1965; Kostlan, Linear Algebra Appl. 162–164, 1992)', () => {
  it('circular law: the fraction of points of z/√N within radius r approaches r² (N = 200)', () => {
    const rng = createRng('circular')
    const N = 200
    const M = 8
    const radii = [0.3, 0.5, 0.7, 0.85]
    const counts = radii.map(() => 0)
    for (let m = 0; m < M; m++) {
      const p = sampleGinibre({ N }, rng).configuration.points
      for (let k = 0; k < N; k++) {
        const r = Math.hypot(p[2 * k], p[2 * k + 1])
        radii.forEach((R, i) => {
          if (r < R) counts[i]++
        })
      }
    }
    radii.forEach((R, i) => {
      // uniform law on the unit disk: F(r) = r² (the circular law; Ginibre 1965); the finite-N edge layer has width ~1/√N
      expect(Math.abs(counts[i] / (M * N) - R * R)).toBeLessThan(0.02)
    })
  })

  it('the finite-N density ρ_N(z) = π⁻¹e^{−|z|²}Σ_{k<N}|z|^{2k}/k! matches a radial histogram of many N = 4 samples', () => {
    const rng = createRng('rho-N')
    const N = 4
    const M = 6000
    const edges = [0, 0.5, 1, 1.5, 2, 2.5, 3, 4]
    const counts = new Array(edges.length - 1).fill(0)
    for (let m = 0; m < M; m++) {
      const ev = ginibreEigenvalues(N, rng)
      for (let k = 0; k < N; k++) {
        const r = Math.hypot(ev.re[k], ev.im[k])
        for (let b = 0; b < edges.length - 1; b++) {
          if (r >= edges[b] && r < edges[b + 1]) counts[b]++
        }
      }
    }
    const rho = (r: number): number => {
      let s = 0
      let term = 1
      for (let k = 0; k < N; k++) {
        s += term
        term *= (r * r) / (k + 1)
      }
      return (Math.exp(-r * r) * s) / Math.PI
    }
    for (let b = 0; b < edges.length - 1; b++) {
      // mean count in the annulus: M ∫ ρ_N 2πr dr; binomial error bar with n = M·N trials
      const p = integrateAdaptive(r => rho(r) * 2 * Math.PI * r, edges[b], edges[b + 1]).value / N
      const expected = M * N * p
      const sd = Math.sqrt(M * N * p * (1 - p))
      expect(Math.abs(counts[b] - expected)).toBeLessThan(4.5 * sd + 1)
    }
  })

  it('Kostlan: E Σ|z|⁴ = Σ_k k(k + 1) (second moments of Gamma(k, 1)), for the Hessenberg model and for full matrices', () => {
    const N = 8
    let exact = 0
    for (let k = 1; k <= N; k++) exact += k * (k + 1)
    for (const model of ['hessenberg', 'full'] as const) {
      const rng = createRng(`kostlan-${model}`)
      const vals: number[] = []
      for (let m = 0; m < 4000; m++) {
        const ev = ginibreEigenvalues(N, rng, model)
        let s = 0
        for (let k = 0; k < N; k++) s += (ev.re[k] ** 2 + ev.im[k] ** 2) ** 2
        vals.push(s)
      }
      const { mean, se } = meanAndError(vals)
      expect(Math.abs(mean - exact)).toBeLessThan(4.5 * se)
    }
  })

  it('the self-check of the counting formula: E #{|z|² < t} → N as t → ∞ and 0 at t = 0', () => {
    expect(expectedCountBelow(5, 0)).toBe(0)
    expect(expectedCountBelow(5, 200)).toBeCloseTo(5, 12)
  })
})

describe('MCMC against exact results', () => {
  it('2-D plasma, β = 2, V = |x|², N = 6 (MALA and Metropolis): radial counts and E Σ|x|⁴ equal Kostlan\'s values within ESS error bars', () => {
    const N = 6
    // E Σ|w|⁴ with w = z/√N: Σ_k k(k+1)/N² (Kostlan 1992)
    let m4 = 0
    for (let k = 1; k <= N; k++) m4 += (k * (k + 1)) / (N * N)
    for (const method of ['mala', 'metropolis'] as const) {
      const res = runMcmc({
        model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadraticPotential(1, 2), beta: 2 },
        N,
        method,
        sweeps: 15000,
        burnIn: 500,
        thin: 1,
      }, { rng: createRng(`plasma-${method}`) })
      const q: number[] = []
      const inner: number[] = []
      const field: number[] = []
      const t = 0.5 // |w|² < 0.5 ⇔ |z|² < N/2
      for (const c of res.configurations) {
        let s = 0
        let s2 = 0
        let count = 0
        for (let k = 0; k < N; k++) {
          const r2 = c.points[2 * k] ** 2 + c.points[2 * k + 1] ** 2
          s += r2 * r2
          s2 += r2
          if (r2 < t) count++
        }
        q.push(s)
        inner.push(count)
        field.push(N * s2)
      }
      const a = integratedAutocorrelation(q)
      expect(Math.abs(a.mean - m4)).toBeLessThan(4.5 * a.standardError)
      const b = integratedAutocorrelation(inner)
      expect(Math.abs(b.mean - expectedCountBelow(N, t * N))).toBeLessThan(4.5 * b.standardError)
      // scaling identity (x → λx in Z, V homogeneous of degree 2, log kernel): E[N Σ V] = dN/β + N(N−1)/2 = 21;
      // the same as Kostlan's E Σ|z|² = N(N+1)/2
      const c = integratedAutocorrelation(field)
      expect(Math.abs(c.mean - 21)).toBeLessThan(4.5 * c.standardError)
      expect(res.trace.length).toBe(15000)
      // the mean energy agrees with that of exact Ginibre samples (both with their error bars)
      const exact: number[] = []
      const rng = createRng(`ginibre-energy-${method}`)
      for (let m = 0; m < 20000; m++) exact.push(energy(sampleGinibre({ N }, rng).configuration, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadraticPotential(1, 2) }).H)
      const ex = meanAndError(exact)
      const ac = res.autocorrelation
      expect(ac).toBeDefined()
      if (ac !== undefined) expect(Math.abs(ac.mean - ex.mean)).toBeLessThan(4.5 * Math.hypot(ac.standardError, ex.se))
      expect(res.configurations.length).toBe(15000)
    }
  })

  it('1-D log-gas, V = x², N = 3: E[H] from Mehta\'s integral at β = 1 and β = 4 (MALA and Metropolis)', () => {
    for (const [beta, method] of [[1, 'metropolis'], [4, 'mala']] as const) {
      const res = runMcmc({
        model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: quadraticPotential(1, 1), beta },
        N: 3,
        method,
        sweeps: 30000,
        burnIn: 500,
        thin: 0,
      }, { rng: createRng(`mehta-${beta}`) })
      const a = res.autocorrelation
      expect(a).toBeDefined()
      if (a === undefined) return
      expect(a.effectiveSampleSize).toBeGreaterThan(1000)
      expect(Math.abs(a.mean - gaussianEnsembleMeanEnergy(3, beta, 1))).toBeLessThan(4.5 * a.standardError)
    }
  })

  it('exact β-Hermite samples and the N = 1 limit agree with the Mehta mean-energy formula (E[H] = 1/β at N = 1)', () => {
    expect(gaussianEnsembleMeanEnergy(1, 2.5, 1)).toBeCloseTo(1 / 2.5, 13)
    const rng = createRng('n2')
    const vals: number[] = []
    for (let m = 0; m < 20000; m++) {
      const ev = betaHermiteEigenvalues(2, 2, rng)
      const x = ev.map(v => v / Math.sqrt(2 * 2))
      vals.push(-2 * Math.log(Math.abs(x[0] - x[1])) + 2 * (x[0] ** 2 + x[1] ** 2))
    }
    const { mean, se } = meanAndError(vals)
    expect(Math.abs(mean - gaussianEnsembleMeanEnergy(2, 2, 1))).toBeLessThan(4.5 * se)
  })
})
