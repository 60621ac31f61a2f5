import { describe, it, expect } from 'vitest'
import { integratedAutocorrelation, runMcmc } from '../../../shared/physics/samplers/mcmc'
import type { McmcOptions } from '../../../shared/physics/samplers/mcmc'
import { createRng } from '../../../shared/physics/random'
import { quadraticPotential } from '../../../shared/physics/potentials/presets'
import { periodicGreen, selfImageConstant } from '../../../shared/physics/torus/ewald'
import { cubicLattice } from '../../../shared/physics/torus/lattice'
import { EngineInputError } from '../../../shared/physics/errors'
import { energy } from '../../../shared/physics/energy'
import { parsePotential } from '../../../shared/physics/potentials/expression'

function meanOf(values: ArrayLike<number>): number {
  let s = 0
  for (let k = 0; k < values.length; k++) s += values[k]
  return s / values.length
}

describe('integrated autocorrelation time (Sokal 1997)', () => {
  it('gives τ_int = (1 + φ)/(1 − φ) for an AR(1) chain x_t = φ x_{t−1} + ε_t', () => {
    // ρ(t) = φ^t, so τ_int = 1 + 2Σ φ^t = (1 + φ)/(1 − φ) (Sokal 1997; common practice)
    const rng = createRng('ar1')
    const phi = 0.8
    const n = 200000
    const x = new Float64Array(n)
    for (let t = 1; t < n; t++) x[t] = phi * x[t - 1] + rng.normal()
    const a = integratedAutocorrelation(x)
    expect(Math.abs(a.tau - 9) / 9).toBeLessThan(0.1)
    expect(a.window).toBeGreaterThanOrEqual(5 * a.tau - 1)
    expect(a.effectiveSampleSize).toBeCloseTo(n / a.tau, 6)
  })

  it('gives τ ≈ 1 for independent values', () => {
    const rng = createRng('iid')
    const x = Float64Array.from({ length: 50000 }, () => rng.normal())
    expect(Math.abs(integratedAutocorrelation(x).tau - 1)).toBeLessThan(0.1)
  })
})

describe('MCMC on a one-dimensional Gaussian target', () => {
  // N = 1: no pairs, π ∝ e^{−(β/2) a x²}, a Gaussian with mean 0 and variance 1/(βa) (exact)
  for (const method of ['mala', 'metropolis'] as const) {
    for (const step of [0.3, 2.5]) {
      it(`${method}, step ${step}: mean 0 and variance 1/(βa) within ESS error bars (detailed balance)`, () => {
        const beta = 2
        const a = 1.5
        const res = runMcmc({
          model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: quadraticPotential(a, 1), beta },
          N: 1,
          method,
          sweeps: 40000,
          stepSize: step,
          adapt: false,
          initial: new Float64Array([0.1]),
        }, { rng: createRng(`${method}-${step}`) })
        const x = res.configurations.map(c => c.points[0])
        const x2 = x.map(v => v * v)
        const m1 = integratedAutocorrelation(x)
        const m2 = integratedAutocorrelation(x2)
        expect(Math.abs(m1.mean)).toBeLessThan(4.5 * m1.standardError)
        expect(Math.abs(m2.mean - 1 / (beta * a))).toBeLessThan(4.5 * m2.standardError)
        expect(res.acceptanceRate).toBeGreaterThan(0.05)
        expect(res.acceptanceRate).toBeLessThan(1)
      })
    }
  }
})

describe('MCMC in free space with power-law kernels', () => {
  it('satisfies the scaling identity E[2NΣV − sP] = 2dN/β (Coulomb in 3-D, Riesz s = 0.5 in 2-D; V = |x|²)', () => {
    // Z = ∫ e^{−(β/2)H(λx)} λ^{dN} dx does not depend on λ (substitute y = λx); at λ = 1 its derivative gives
    // (β/2) E[2NΣV − sP] = dN with P = Σ_{i≠j}|x_i − x_j|^{−s} (virial identity; common practice)
    const cases = [
      { kernel: { name: 'coulomb' as const }, d: 3 as const, s: 1, method: 'mala' as const },
      { kernel: { name: 'coulomb' as const }, d: 3 as const, s: 1, method: 'metropolis' as const },
      { kernel: { name: 'riesz' as const, s: 0.5 }, d: 2 as const, s: 0.5, method: 'metropolis' as const },
    ]
    for (const c of cases) {
      const N = 5
      const beta = 2
      const V = quadraticPotential(1, c.d)
      const res = runMcmc({
        model: { kernel: c.kernel, geometry: { kind: 'free', d: c.d }, potential: V, beta },
        N,
        method: c.method,
        sweeps: 12000,
        burnIn: 300,
      }, { rng: createRng(`virial-${c.d}-${c.method}`) })
      const w = res.configurations.map((conf) => {
        const e = energy(conf, { kernel: c.kernel, geometry: { kind: 'free', d: c.d }, potential: V })
        return 2 * N * e.confinement - c.s * 2 * e.pairSum
      })
      const a = integratedAutocorrelation(w)
      expect(Math.abs(a.mean - (2 * c.d * N) / beta)).toBeLessThan(4.5 * a.standardError)
    }
  })
})

describe('MCMC with a potential defined on part of the line', () => {
  it('rejects moves outside the domain: V = x − k log x, N = 1 gives a Gamma(βk/2 + 1, 2/β) law with mean k + 2/β', () => {
    // one point: weight e^{−(β/2)(x − k log x)} = x^{βk/2} e^{−βx/2} on x > 0, a Gamma density (common practice)
    const V = parsePotential('x - k*log(x)', { d: 1, parameters: { k: 1.5 } })
    for (const method of ['metropolis', 'mala'] as const) {
      const res = runMcmc({
        model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: V, beta: 2 },
        N: 1,
        method,
        sweeps: 30000,
        burnIn: 300,
        initial: new Float64Array([1]),
      }, { rng: createRng(`gamma-${method}`) })
      const x = res.configurations.map(c => c.points[0])
      expect(Math.min(...x)).toBeGreaterThan(0)
      const a = integratedAutocorrelation(x)
      expect(Math.abs(a.mean - 2.5)).toBeLessThan(4.5 * a.standardError)
    }
    expect(() => runMcmc({
      model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: V, beta: 2 },
      N: 2,
      sweeps: 1,
      initial: new Float64Array([1, -1]),
    }, { rng: createRng(1) })).toThrow(/starting point 1/)
  })
})

describe('MCMC on the sphere and the torus', () => {
  it('two points on S² with the log kernel at β = 2: E[x₁·x₂] = −1/3', () => {
    // for independent uniform points t = x₁·x₂ is uniform on [−1, 1] (Archimedes' hat-box theorem); the Gibbs
    // weight e^{−(β/2)·2(−log|x₁ − x₂|)} = |x₁ − x₂|^β = (2 − 2t)^{β/2} ∝ 1 − t at β = 2, so E t = −1/3
    for (const method of ['mala', 'metropolis'] as const) {
      const res = runMcmc({
        model: { kernel: { name: 'log' }, geometry: { kind: 'sphere' }, beta: 2 },
        N: 2,
        method,
        sweeps: 30000,
        burnIn: 200,
      }, { rng: createRng(`sphere-${method}`) })
      const t = res.configurations.map(c => c.points[0] * c.points[3] + c.points[1] * c.points[4] + c.points[2] * c.points[5])
      for (const c of res.configurations.slice(0, 50)) {
        expect(Math.hypot(c.points[0], c.points[1], c.points[2])).toBeCloseTo(1, 14)
      }
      const a = integratedAutocorrelation(t)
      expect(Math.abs(a.mean + 1 / 3)).toBeLessThan(4.5 * a.standardError)
    }
  })

  it('two points on the unit square torus (2-D log, Ewald): E[H_T] by quadrature of e^{−βG}', () => {
    // H_T = Σ_{i≠j} G + N c₀ = 2G(x₁ − x₂) + 2c₀ (the canonical torus energy of this engine);
    // the difference is uniform on the cell with weight e^{−(β/2)·2G} = e^{−βG}
    const beta = 2
    const lattice = cubicLattice(2, 1)
    const n = 40
    let z = 0
    let m = 0
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const G = periodicGreen(lattice, [(i + 0.5) / n, (j + 0.5) / n])
        const w = Math.exp(-beta * G)
        z += w
        m += w * G
      }
    }
    const c0 = selfImageConstant(lattice).value
    const expected = 2 * (m / z) + 2 * c0
    const res = runMcmc({
      model: { kernel: { name: 'log' }, geometry: { kind: 'torus', d: 2, L: 1 }, beta },
      N: 2,
      sweeps: 4000,
      burnIn: 100,
      thin: 0,
    }, { rng: createRng('torus') })
    const a = res.autocorrelation
    expect(a).toBeDefined()
    if (a === undefined) return
    expect(Math.abs(a.mean - expected)).toBeLessThan(4.5 * a.standardError + 2e-3)
  })
})

describe('resuming a chain', () => {
  const base: McmcOptions = {
    model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadraticPotential(1, 2), beta: 3 },
    N: 7,
    sweeps: 60,
    burnIn: 30,
    thin: 4,
  }

  for (const method of ['metropolis', 'mala'] as const) {
    it(`${method}: stopping inside burn-in and after it, then resuming from JSON, gives the same chain bit for bit`, () => {
      const whole = runMcmc({ ...base, method }, { rng: createRng('resume') })
      expect(whole.stopped).toBe(false)
      const first = runMcmc({ ...base, method, stopAtIteration: 17 }, { rng: createRng('resume') })
      expect(first.stopped).toBe(true)
      const second = runMcmc({ ...base, method, stopAtIteration: 55 }, { resume: JSON.parse(JSON.stringify(first.state)) })
      const third = runMcmc({ ...base, method }, { resume: JSON.parse(JSON.stringify(second.state)) })
      expect(Array.from(third.trace)).toEqual(Array.from(whole.trace))
      expect(third.state).toEqual(whole.state)
      expect(third.stepSize).toBe(whole.stepSize)
      const pieces = [...first.configurations, ...second.configurations, ...third.configurations].map(c => Array.from(c.points))
      expect(pieces).toEqual(whole.configurations.map(c => Array.from(c.points)))
      expect([...first.keptAt, ...second.keptAt, ...third.keptAt]).toEqual(whole.keptAt)
    })
  }

  it('sphere MALA resumes exactly too', () => {
    const opts: McmcOptions = { model: { kernel: { name: 'riesz', s: 1 }, geometry: { kind: 'sphere' }, beta: 5 }, N: 5, method: 'mala', sweeps: 20, burnIn: 5 }
    const whole = runMcmc(opts, { rng: createRng(11) })
    const part = runMcmc({ ...opts, stopAtIteration: 9 }, { rng: createRng(11) })
    const rest = runMcmc(opts, { resume: part.state })
    expect(rest.state).toEqual(whole.state)
  })
})

describe('MCMC bookkeeping and errors', () => {
  it('adapts the step size during burn-in only and reports progress', () => {
    const calls: Array<[number, number]> = []
    const res = runMcmc({
      model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: quadraticPotential(1, 1), beta: 2 },
      N: 10,
      sweeps: 20,
      burnIn: 200,
      stepSize: 5,
      onProgress: (done, total) => calls.push([done, total]),
    }, { rng: createRng(1) })
    expect(calls.length).toBe(220)
    expect(calls[219]).toEqual([220, 220])
    expect(res.stepSize).toBeLessThan(1) // moved away from the poor initial 5
    expect(res.state.stepSize).toBe(res.stepSize)
    expect(res.trace.length).toBe(20)
    expect(res.acceptanceRate).toBeGreaterThan(0.2)
    expect(meanOf(res.trace)).toBeGreaterThan(0)
  })

  it('refuses impossible settings with a clear message', () => {
    const rng = createRng(1)
    expect(() => runMcmc({ model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, beta: 2 }, N: 3, sweeps: 1 }, { rng })).toThrow(/confining/)
    expect(() => runMcmc({ model: { kernel: { name: 'log' }, geometry: { kind: 'torus', d: 2, L: 1 }, beta: 2 }, N: 3, sweeps: 1, method: 'mala' }, { rng })).toThrow(/MALA/)
    expect(() => runMcmc({ model: { kernel: { name: 'riesz', s: 1 }, geometry: { kind: 'torus', d: 2, L: 1 }, beta: 2 }, N: 3, sweeps: 1 }, { rng })).toThrow(/Coulomb/)
    expect(() => runMcmc({ model: { kernel: { name: 'log' }, geometry: { kind: 'sphere' }, beta: 0 }, N: 3, sweeps: 1 }, { rng })).toThrow(EngineInputError)
    const ok = runMcmc({ model: { kernel: { name: 'log' }, geometry: { kind: 'sphere' }, beta: 1 }, N: 3, sweeps: 2 }, { rng })
    expect(() => runMcmc({ model: { kernel: { name: 'log' }, geometry: { kind: 'sphere' }, beta: 1 }, N: 4, sweeps: 2 }, { resume: ok.state })).toThrow(/N = 3/)
    expect(() => runMcmc({ model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: quadraticPotential(1, 1), beta: 1 }, N: 2, sweeps: 1, initial: new Float64Array([0, Number.NaN]) }, { rng })).toThrow(/initial point 1/)
  })
})
