import { describe, it, expect } from 'vitest'
import { confinement, energy, pairSum, pairSumNaive } from '../../../shared/physics/energy'
import { EngineInputError } from '../../../shared/physics/errors'
import { ENGINE_VERSION } from '../../../shared/physics/version'
import type { Configuration, Geometry, Kernel } from '../../../shared/physics/types'
import type { Potential } from '../../../shared/physics/potentials/types'
import { quadraticPotential } from '../../../shared/physics/potentials/presets'

// Tiny LCG for test inputs only (common practice).
function lcg(seed: number): () => number {
  let s = seed >>> 0
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0
    return s / 4294967296
  }
}

function randomConf(N: number, d: number, seed: number, scale = 1): Configuration {
  const rand = lcg(seed)
  const points = new Float64Array(N * d)
  for (let k = 0; k < points.length; k++) points[k] = scale * (2 * rand() - 1)
  return { N, d, points }
}

function randomSphere(N: number, seed: number): Configuration {
  const rand = lcg(seed)
  const points = new Float64Array(3 * N)
  for (let i = 0; i < N; i++) {
    const z = 2 * rand() - 1
    const phi = 2 * Math.PI * rand()
    const r = Math.sqrt(1 - z * z)
    points.set([r * Math.cos(phi), r * Math.sin(phi), z], 3 * i)
  }
  return { N, d: 3, points }
}

// The engine's quadratic preset V = a|x|² (its own tests are in tests/unit/physics/potentials.test.ts).
const quadratic = quadraticPotential

const cases: Array<{ kernel: Kernel, geometry: Geometry, d: number }> = [
  { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, d: 1 },
  { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, d: 2 },
  { kernel: { name: 'riesz', s: 0.5 }, geometry: { kind: 'free', d: 2 }, d: 2 },
  { kernel: { name: 'coulomb' }, geometry: { kind: 'free', d: 3 }, d: 3 },
  { kernel: { name: 'riesz', s: 1.5 }, geometry: { kind: 'free', d: 3 }, d: 3 },
  { kernel: { name: 'log' }, geometry: { kind: 'free', d: 3 }, d: 3 },
]

describe('pair sums', () => {
  it('agrees with the naive double loop to 1e-13 relative (free space and sphere)', () => {
    for (const [n, c] of cases.entries()) {
      const conf = randomConf(300, c.d, 100 + n, 3)
      const fast = pairSum(conf, c.kernel, c.geometry)
      const naive = pairSumNaive(conf, c.kernel, c.geometry)
      expect(Math.abs(fast - naive)).toBeLessThanOrEqual(1e-13 * Math.abs(naive))
    }
    for (const kernel of [{ name: 'log' }, { name: 'riesz', s: 1 }, { name: 'coulomb' }] as Kernel[]) {
      const conf = randomSphere(250, 9)
      const fast = pairSum(conf, kernel, { kind: 'sphere' })
      const naive = pairSumNaive(conf, kernel, { kind: 'sphere' })
      expect(Math.abs(fast - naive)).toBeLessThanOrEqual(1e-13 * Math.abs(naive))
    }
  })

  it('does not depend on the order of the points beyond rounding', () => {
    const conf = randomConf(260, 2, 3, 2)
    const N = conf.N
    const perm = Array.from({ length: N }, (_, i) => N - 1 - i)
    const permuted = new Float64Array(2 * N)
    perm.forEach((p, i) => permuted.set(conf.points.subarray(2 * p, 2 * p + 2), 2 * i))
    for (const kernel of [{ name: 'log' }, { name: 'riesz', s: 1 }] as Kernel[]) {
      const a = pairSum(conf, kernel, { kind: 'free', d: 2 })
      const b = pairSum({ N, d: 2, points: permuted }, kernel, { kind: 'free', d: 2 })
      expect(Math.abs(a - b)).toBeLessThanOrEqual(4e-15 * Math.abs(a))
      expect(pairSum(conf, kernel, { kind: 'free', d: 2 })).toBe(a) // identical run to run
    }
  })

  it('gives exact small sums', () => {
    // points 0, 1, 3 on the line: −(log 1 + log 3 + log 2) = −log 6
    const line: Configuration = { N: 3, d: 1, points: Float64Array.from([0, 1, 3]) }
    expect(pairSum(line, { name: 'log' }, { kind: 'free', d: 1 })).toBeCloseTo(-Math.log(6), 15)
    // two points at distance 2 in R³: 1/2; |x|^(−2): 1/4
    const pair: Configuration = { N: 2, d: 3, points: Float64Array.from([0, 0, 1, 0, 0, -1]) }
    expect(pairSum(pair, { name: 'coulomb' }, { kind: 'free', d: 3 })).toBe(0.5)
    expect(pairSum(pair, { name: 'riesz', s: 2 }, { kind: 'sphere' })).toBe(0.25)
    expect(pairSum({ N: 1, d: 2, points: Float64Array.from([1, 2]) }, { name: 'log' }, { kind: 'free', d: 2 })).toBe(0)
  })

  it('handles extreme distances in the product of squared distances', () => {
    // spacings 1e−100 … 1e100: factors outside [1e−150, 1e150] and products that must be flushed
    const xs = [0, 1e-100, 3e-100, 1e-60, 2e-60, 1, 2, 1e100, 3e100, 5e120]
    const conf: Configuration = { N: xs.length, d: 1, points: Float64Array.from(xs) }
    let expected = 0
    for (let i = 0; i < xs.length; i++) for (let j = i + 1; j < xs.length; j++) expected -= Math.log(Math.abs(xs[i] - xs[j]))
    const got = pairSum(conf, { name: 'log' }, { kind: 'free', d: 1 })
    expect(Number.isFinite(got)).toBe(true)
    expect(Math.abs(got - expected)).toBeLessThanOrEqual(1e-13 * Math.abs(expected))
    // many tiny distances in one block: the running product would underflow without flushing
    const tiny = Float64Array.from({ length: 60 }, (_, i) => i * 1e-20)
    const t = pairSum({ N: 60, d: 1, points: tiny }, { name: 'log' }, { kind: 'free', d: 1 })
    const tn = pairSumNaive({ N: 60, d: 1, points: tiny }, { name: 'log' }, { kind: 'free', d: 1 })
    expect(Math.abs(t - tn)).toBeLessThanOrEqual(1e-13 * Math.abs(tn))
  })

  it('names both indices of coincident points', () => {
    const conf = randomConf(200, 2, 77)
    conf.points[2 * 150] = conf.points[2 * 3]
    conf.points[2 * 150 + 1] = conf.points[2 * 3 + 1]
    for (const kernel of [{ name: 'log' }, { name: 'riesz', s: 1 }] as Kernel[]) {
      for (const fn of [pairSum, pairSumNaive]) {
        let caught: unknown
        try {
          fn(conf, kernel, { kind: 'free', d: 2 })
        }
        catch (e) {
          caught = e
        }
        expect(caught).toBeInstanceOf(EngineInputError)
        expect((caught as EngineInputError).where.indices).toEqual([3, 150])
        expect((caught as EngineInputError).message).toMatch(/points 3 and 150 coincide/)
      }
    }
  })

  it('rejects bad input with a clear message', () => {
    const conf = randomConf(5, 2, 1)
    conf.points[7] = Number.NaN
    expect(() => pairSum(conf, { name: 'log' }, { kind: 'free', d: 2 })).toThrow(/point 3/)
    const ok = randomConf(5, 2, 1)
    expect(() => pairSum(ok, { name: 'log' }, { kind: 'free', d: 3 })).toThrow(/2 coordinates/)
    expect(() => pairSum(ok, { name: 'log' }, { kind: 'torus', d: 2, L: 1 })).toThrow(/ewald/i)
    expect(() => pairSum(ok, { name: 'coulomb' }, { kind: 'free', d: 2 })).toThrow(EngineInputError)
    expect(() => pairSum(ok, { name: 'log' }, { kind: 'sphere' })).toThrow(/3/)
    expect(() => pairSum({ N: 3, d: 2, points: new Float64Array(5) }, { name: 'log' }, { kind: 'free', d: 2 })).toThrow(/6 numbers/)
  })
})

describe('confinement and energy', () => {
  it('sums V and assembles H = Σ_{i≠j} g + N Σ V in the canonical and a requested convention', () => {
    const conf = randomConf(40, 2, 8)
    const V = quadratic(1.5, 2)
    let expectedC = 0
    for (let i = 0; i < conf.N; i++) expectedC += 1.5 * (conf.points[2 * i] ** 2 + conf.points[2 * i + 1] ** 2)
    const C = confinement(conf, V)
    expect(C).toBeCloseTo(expectedC, 12)
    const ps = pairSumNaive(conf, { name: 'log' }, { kind: 'free', d: 2 })
    const res = energy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: V }, { pairs: 'half', fieldScale: 1, logSign: 'plus-log', gibbs: 'beta' })
    expect(res.N).toBe(40)
    expect(res.d).toBe(2)
    expect(res.pairSum).toBeCloseTo(ps, 12)
    expect(res.confinement).toBe(C)
    expect(res.H).toBeCloseTo(2 * ps + 40 * expectedC, 10)
    expect(res.Hconv).toBeCloseTo(-(ps + expectedC), 10)
    expect(res.engineVersion).toBe(ENGINE_VERSION)
    const canonical = energy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 } })
    expect(canonical.confinement).toBe(0)
    expect(canonical.Hconv).toBe(canonical.H)
    expect(canonical.convention).toEqual({ pairs: 'full', fieldScale: 'N', logSign: 'minus-log', gibbs: 'beta/2' })
  })

  it('refuses a potential on the sphere, a potential of the wrong dimension, and a non-finite V', () => {
    const s = randomSphere(4, 2)
    expect(() => energy(s, { kernel: { name: 'log' }, geometry: { kind: 'sphere' }, potential: quadratic(1, 3) })).toThrow(/sphere/)
    const conf = randomConf(4, 2, 2)
    expect(() => confinement(conf, quadratic(1, 3))).toThrow(/dimension 3/)
    const bad: Potential = { ...quadratic(1, 2), value: (p, o = 0) => (o === 4 ? Infinity : 0) }
    expect(() => confinement(conf, bad)).toThrow(/point 2/)
  })
})
