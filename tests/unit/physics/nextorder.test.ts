import { describe, it, expect } from 'vitest'
import { nextOrderEnergy, normaliseNextOrder } from '../../../shared/physics/nextorder'
import { semicircleMeasure, uniformDiskMeasure } from '../../../shared/physics/equilibrium/closed-forms'
import { ENGINE_VERSION } from '../../../shared/physics/version'
import { CANONICAL_CONVENTION } from '../../../shared/physics/conventions'
import { EngineInputError } from '../../../shared/physics/errors'
import type { Configuration } from '../../../shared/physics/types'
import { quadraticPotential } from '../../../shared/physics/potentials/presets'

// The engine's quadratic preset V = a|x|² (its own tests are in tests/unit/physics/potentials.test.ts).
const quadratic = quadraticPotential

describe('next-order energy', () => {
  it('one point at the centre of the disk: F_1 = −2 h(0) + ∬ = −1 + ¼ (a = 1, uniform disk; Saff & Totik 1997, ch. IV)', () => {
    const conf: Configuration = { N: 1, d: 2, points: Float64Array.from([0, 0]) }
    const res = nextOrderEnergy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadratic(1, 2) })
    expect(res.nextOrder).toBeCloseTo(-0.75, 15)
    expect(res.H).toBe(0)
    expect(res.IV).toBeCloseTo(0.75, 15)
    expect(res.cV).toBeCloseTo(0.5, 15)
    expect(res.zetaSum).toBe(0)
    expect(res.normalisedNextOrder).toBeCloseTo(-0.75, 15) // (F + (1/2) log 1)/1
    expect(res.convention).toEqual(CANONICAL_CONVENTION)
    expect(res.engineVersion).toBe(ENGINE_VERSION)
    expect(res.measure.method).toBe('closed-form')
  })

  it('two points on the line: every term by hand (semicircle, a = 1)', () => {
    // x = ±1/2 inside [−√2, √2]: h = ½ log 2 + ½ − x²/2, ∬ = ½ log 2 + ¼
    const conf: Configuration = { N: 2, d: 1, points: Float64Array.from([-0.5, 0.5]) }
    const res = nextOrderEnergy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: quadratic(1, 1) })
    const h = 0.5 * Math.log(2) + 0.5 - 0.125
    const F = 2 * -Math.log(1) - 2 * 2 * (2 * h) + 4 * (0.5 * Math.log(2) + 0.25)
    expect(res.nextOrder).toBeCloseTo(F, 14)
    expect(res.normalisedNextOrder).toBeCloseTo((F + 2 * Math.log(2)) / 2, 14) // d = 1: (F + N log N)/N
    expect(res.normalisation).toBe('(F_N + (N/1) log N)/N')
  })

  it('uses the measure it is given', () => {
    const conf: Configuration = { N: 3, d: 1, points: Float64Array.from([-1, 0.2, 3]) }
    const own = semicircleMeasure(2)
    const res = nextOrderEnergy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: quadratic(1, 1), measure: own })
    expect(res.IV).toBe(own.IV)
    // μ is not μ_V for V = x², so the splitting with μ_V's constants does not hold
    expect(res.splittingResidual.relative).toBeGreaterThan(1e-6)
  })

  it('takes the pair sum by the chosen method: N-th roots of unity on a circle of radius ρ', () => {
    // Σ_{i<j} −log|ρω^i − ρω^j| = −(N/2) log N − (N(N−1)/2) log ρ, since |Π_{j≠i}(ω^i − ω^j)| = N
    // (elementary: the derivative of z^N − 1 at a root; common practice)
    const ring = (N: number, rho: number): Configuration => {
      const points = new Float64Array(2 * N)
      for (let k = 0; k < N; k++) {
        points[2 * k] = rho * Math.cos((2 * Math.PI * k) / N)
        points[2 * k + 1] = rho * Math.sin((2 * Math.PI * k) / N)
      }
      return { N, d: 2, points }
    }
    const exact = (N: number, rho: number) => -(N / 2) * Math.log(N) - ((N * (N - 1)) / 2) * Math.log(rho)
    const setting = { kernel: { name: 'log' as const }, geometry: { kind: 'free' as const, d: 2 as const }, potential: quadratic(1, 2) }
    const small = nextOrderEnergy(ring(200, 0.5), setting)
    expect(small.pairMethod).toMatch(/^direct-/)
    expect(small.pairErrorBound).toBe(0)
    expect(Math.abs(small.pairSum - exact(200, 0.5))).toBeLessThan(1e-12 * Math.abs(exact(200, 0.5)))
    const N = 60000
    const big = nextOrderEnergy(ring(N, 0.5), { ...setting, tolerance: 1e-8 })
    expect(big.pairMethod).toBe('fmm2d')
    expect(big.pairErrorBound).toBeGreaterThan(0)
    expect(big.pairErrorBound).toBeLessThanOrEqual(1e-8)
    const ref = exact(N, 0.5)
    expect(Math.abs(big.pairSum - ref)).toBeLessThanOrEqual((big.pairErrorBound + 1e-14) * Math.abs(ref))
    // F_N and H_N are built from that pair sum, so the splitting identity still closes
    expect(big.splittingResidual.relative).toBeLessThan(1e-12)
    expect(() => nextOrderEnergy(ring(10, 0.5), { ...setting, tolerance: 2 })).toThrow(/tolerance/)
  })

  it('normalises by the published rates', () => {
    expect(normaliseNextOrder(-10, 100, { name: 'log' }, { kind: 'free', d: 2 }).value).toBeCloseTo((-10 + 50 * Math.log(100)) / 100, 14)
    expect(normaliseNextOrder(-10, 100, { name: 'log' }, { kind: 'sphere' }).label).toBe('(F_N + (N/2) log N)/N')
    expect(normaliseNextOrder(-10, 1000, { name: 'coulomb' }, { kind: 'free', d: 3 }).value).toBeCloseTo(-10 / 1000 ** (4 / 3), 16)
    expect(normaliseNextOrder(-10, 1000, { name: 'riesz', s: 1.5 }, { kind: 'free', d: 3 }).value).toBeCloseTo(-10 / 1000 ** 1.5, 16)
    expect(() => normaliseNextOrder(1, 10, { name: 'riesz', s: 3 }, { kind: 'free', d: 2 })).toThrow(EngineInputError)
  })

  it('refuses the torus, a potential on the sphere, and a measure of the wrong dimension', () => {
    const conf: Configuration = { N: 2, d: 2, points: Float64Array.from([0, 0, 0.5, 0]) }
    expect(() => nextOrderEnergy(conf, { kernel: { name: 'log' }, geometry: { kind: 'torus', d: 2, L: 1 } })).toThrow(/ewald/i)
    const s: Configuration = { N: 2, d: 3, points: Float64Array.from([0, 0, 1, 0, 0, -1]) }
    expect(() => nextOrderEnergy(s, { kernel: { name: 'log' }, geometry: { kind: 'sphere' }, potential: quadratic(1, 3) })).toThrow(/sphere/)
    expect(() => nextOrderEnergy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadratic(1, 2), measure: semicircleMeasure(1) })).toThrow(/dimension/)
    expect(() => nextOrderEnergy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 } })).toThrow(/confining potential/)
    expect(uniformDiskMeasure(1).d).toBe(2)
  })
})
