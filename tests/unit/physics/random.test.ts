import { describe, it, expect } from 'vitest'
import { createRng, rngFromState, Rng } from '../../../shared/physics/random'
import { EngineInputError } from '../../../shared/physics/errors'

function moments(draw: () => number, n: number): { mean: number, variance: number, m4: number } {
  let s = 0
  const xs = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    xs[k] = draw()
    s += xs[k]
  }
  const mean = s / n
  let v = 0
  let q = 0
  for (let k = 0; k < n; k++) {
    const d = xs[k] - mean
    v += d * d
    q += d * d * d * d
  }
  return { mean, variance: v / (n - 1), m4: q / n }
}

describe('seeded generator', () => {
  it('gives the same stream for the same seed and different streams for different seeds', () => {
    const a = createRng(42)
    const b = createRng(42)
    const c = createRng(43)
    const s = createRng('42')
    const xa = Array.from({ length: 20 }, () => a.uniform())
    const xb = Array.from({ length: 20 }, () => b.uniform())
    const xc = Array.from({ length: 20 }, () => c.uniform())
    const xs = Array.from({ length: 20 }, () => s.uniform())
    expect(xa).toEqual(xb)
    expect(xa).not.toEqual(xc)
    expect(xa).not.toEqual(xs)
    expect(createRng('run-7').uniform()).toBe(createRng('run-7').uniform())
  })

  it('draws uniforms in [0, 1) with mean 1/2 and variance 1/12', () => {
    const rng = createRng(1)
    const n = 200000
    const m = moments(() => rng.uniform(), n)
    // exact moments of U(0, 1) (common practice); 5 standard errors
    expect(Math.abs(m.mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n))
    expect(Math.abs(m.variance - 1 / 12)).toBeLessThan(5 * Math.sqrt(1 / 180 / n))
    const r2 = createRng(2)
    for (let k = 0; k < 10000; k++) {
      const u = r2.uniform()
      expect(u >= 0 && u < 1).toBe(true)
    }
  })

  it('uses 53 bits: uniforms are multiples of 2^-53 and not all multiples of 2^-32', () => {
    const rng = createRng(5)
    let fine = 0
    for (let k = 0; k < 100; k++) {
      const u = rng.uniform()
      expect(Number.isInteger(u * 2 ** 53)).toBe(true)
      if (!Number.isInteger(u * 2 ** 32)) fine++
    }
    expect(fine).toBeGreaterThan(90)
  })

  it('draws standard normals (mean 0, variance 1, fourth moment 3)', () => {
    const rng = createRng('normal')
    const n = 200000
    const m = moments(() => rng.normal(), n)
    // N(0,1): E x = 0, Var = 1, E x^4 = 3, Var(x^2) = 2, Var(x^4) = 96 (common practice)
    expect(Math.abs(m.mean)).toBeLessThan(5 / Math.sqrt(n))
    expect(Math.abs(m.variance - 1)).toBeLessThan(5 * Math.sqrt(2 / n))
    expect(Math.abs(m.m4 - 3)).toBeLessThan(5 * Math.sqrt(96 / n))
  })

  it('draws Gamma(k) with mean k and variance k, also for k < 1 (Marsaglia & Tsang 2000)', () => {
    const rng = createRng(9)
    const n = 100000
    for (const k of [0.3, 1, 3.7, 25]) {
      const m = moments(() => rng.gamma(k), n)
      // Gamma(k, 1): mean k, variance k, Var(sample variance) ≈ (E(x−k)^4 − k²)/n = (3k² + 6k − k²)/n (common practice)
      expect(Math.abs(m.mean - k)).toBeLessThan(5 * Math.sqrt(k / n))
      expect(Math.abs(m.variance - k)).toBeLessThan(5 * Math.sqrt((2 * k * k + 6 * k) / n))
    }
    expect(rng.gamma(0)).toBe(0)
  })

  it('draws χ_k with E χ² = k for real k', () => {
    const rng = createRng(10)
    const n = 100000
    for (const k of [0.5, 2, 7.3]) {
      const m = moments(() => rng.chi(k) ** 2, n)
      // χ²_k: mean k, variance 2k (common practice)
      expect(Math.abs(m.mean - k)).toBeLessThan(5 * Math.sqrt((2 * k) / n))
    }
  })

  it('resumes exactly from a saved state, including a kept normal variate', () => {
    const rng = createRng(77)
    rng.uniform()
    rng.normal() // leaves a spare normal
    const saved = JSON.parse(JSON.stringify(rng.state()))
    const next = [rng.normal(), rng.uniform(), rng.gamma(2.5), rng.normal()]
    const again = rngFromState(saved)
    expect([again.normal(), again.uniform(), again.gamma(2.5), again.normal()]).toEqual(next)
    const viaStatic = Rng.fromState(saved)
    expect(viaStatic.normal()).toBe(next[0])
  })

  it('splits into independent, reproducible streams without changing the parent', () => {
    const parent = createRng(3)
    const before = parent.state()
    const s0 = parent.split(0)
    const s1 = parent.split(1)
    expect(parent.state()).toEqual(before)
    const a = Array.from({ length: 10 }, () => s0.uniform())
    const b = Array.from({ length: 10 }, () => s1.uniform())
    const p = Array.from({ length: 10 }, () => parent.uniform())
    expect(a).not.toEqual(b)
    expect(a).not.toEqual(p)
    expect(Array.from({ length: 10 }, () => createRng(3).split(1).uniform())[0]).toBe(b[0])
    const j = createRng(3).jump()
    expect(j.uniform()).toBe(a[0])
  })

  it('draws uniform integers in range', () => {
    const rng = createRng(4)
    const counts = [0, 0, 0]
    for (let k = 0; k < 30000; k++) counts[rng.integer(3)]++
    for (const c of counts) expect(Math.abs(c - 10000)).toBeLessThan(5 * Math.sqrt(30000 * (1 / 3) * (2 / 3)))
  })

  it('refuses bad seeds and states with a clear error', () => {
    expect(() => createRng(Number.NaN)).toThrow(EngineInputError)
    expect(() => rngFromState({ algorithm: 'other', words: [1, 2, 3, 4], spareNormal: null })).toThrow(/algorithm/)
    expect(() => rngFromState({ algorithm: 'xoroshiro128+', words: [0, 0, 0, 0], spareNormal: null })).toThrow(/zero/)
    expect(() => rngFromState({ algorithm: 'xoroshiro128+', words: [1, 2], spareNormal: null })).toThrow(/four/)
    expect(() => createRng(1).gamma(-1)).toThrow(/shape/)
  })
})
