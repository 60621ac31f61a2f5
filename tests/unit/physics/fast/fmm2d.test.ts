import { describe, it, expect } from 'vitest'
import { pairSum } from '../../../../shared/physics/energy'
import { EngineInputError } from '../../../../shared/physics/errors'
import { fmm2dEnergy, fmm2dFields, logTail } from '../../../../shared/physics/fast/fmm2d'
import { wasmPairSum } from '../../../../shared/physics/fast/wasm'
import { directFields } from '../../../../shared/physics/fast/direct'
import { clustered, lattice, relErr, uniform } from './configurations'

const free2 = { kind: 'free', d: 2 } as const

describe('per-pair truncation bound ε(θ, p) = Σ_{n>p} θ^n/n', () => {
  it('equals −log(1 − θ) − Σ_{n≤p} θ^n/n (the series of −log(1 − θ); common practice)', () => {
    for (const theta of [0.3, 0.5, 0.6]) {
      for (const p of [0, 1, 5, 10]) {
        let partial = 0
        for (let n = 1; n <= p; n++) partial += Math.pow(theta, n) / n
        expect(logTail(theta, p)).toBeCloseTo(-Math.log1p(-theta) - partial, 14)
      }
    }
  })
})

describe('2-D log FMM energies against direct sums', () => {
  // Greengard & Rokhlin (1987): the measured error must stay below the requested tolerance and below
  // the stated bound of the truncation.
  const configurations: Array<[string, Float64Array]> = [
    ['uniform', uniform(20000, 2, 1)],
    ['clustered (scales 1, 1e−2, 1e−5)', clustered(12000, 2, 2)],
    ['square lattice', lattice(10000, 2)],
  ]
  for (const [name, points] of configurations) {
    it(`${name}: error ≤ tolerance at 1e−4, 1e−8, 1e−12`, () => {
      const exact = wasmPairSum(points, 2, { name: 'log' }, free2)
      for (const tolerance of [1e-4, 1e-8, 1e-12]) {
        const r = fmm2dEnergy(points, { tolerance })
        const err = relErr(r.value, exact)
        expect(err).toBeLessThanOrEqual(tolerance)
        // the bound holds up to rounding of the compensated sums
        expect(err).toBeLessThanOrEqual(r.errorBound + 1e-14)
        expect(r.errorBound).toBeLessThanOrEqual(tolerance)
        expect(r.parameters.farPairs).toBeGreaterThan(0)
      }
    }, 30_000)
  }

  it('a small leaf size and a fixed order give the same energy within the bound', () => {
    const points = clustered(3000, 2, 7)
    const exact = pairSum({ N: 3000, d: 2, points }, { name: 'log' }, free2)
    const r = fmm2dEnergy(points, { order: 12, leafSize: 4, theta: 0.5 })
    expect(r.parameters.order).toBe(12)
    expect(Math.abs(r.value - exact)).toBeLessThanOrEqual(r.absoluteErrorBound + 1e-12 * Math.abs(exact))
  })

  it('adapts to clustered points: deep branches, error still below tolerance', () => {
    const points = clustered(6000, 2, 3)
    const r = fmm2dEnergy(points, { tolerance: 1e-10, leafSize: 16 })
    const exact = wasmPairSum(points, 2, { name: 'log' }, free2)
    expect(relErr(r.value, exact)).toBeLessThanOrEqual(1e-10)
    // a uniform quadtree down to the 1e−5 cluster would need ~4^17 cells; the adaptive one is small
    expect(r.parameters.nodes).toBeLessThan(6000)
  })
})

describe('2-D log FMM potentials and forces', () => {
  it('agree with the direct fields within the stated bounds', () => {
    for (const points of [uniform(3000, 2, 4), clustered(3000, 2, 5)]) {
      const tol = 1e-10
      const f = fmm2dFields(points, { tolerance: tol })
      const ref = directFields(points, 2, { name: 'log' })
      const N = 3000
      for (let i = 0; i < N; i++) {
        expect(Math.abs(f.potential[i] - ref.potential[i])).toBeLessThanOrEqual(N * f.pairErrorBound + 1e-12 * Math.max(1, Math.abs(ref.potential[i])))
      }
      // force error ≤ bound · Σ_j 1/|x_i − x_j|
      for (let i = 0; i < N; i += 37) {
        let s = 0
        for (let j = 0; j < N; j++) {
          if (j !== i) s += 1 / Math.hypot(points[2 * i] - points[2 * j], points[2 * i + 1] - points[2 * j + 1])
        }
        const e = Math.hypot(f.force[2 * i] - ref.force[2 * i], f.force[2 * i + 1] - ref.force[2 * i + 1])
        expect(e).toBeLessThanOrEqual(f.forceErrorBound * s + 1e-13 * s)
      }
    }
  }, 30_000)

  it('forces are minus the gradient of the energy (central finite differences)', () => {
    const N = 300
    const points = uniform(N, 2, 6)
    const f = fmm2dFields(points, { tolerance: 1e-12, leafSize: 8 })
    const h = 1e-5
    for (const i of [0, 17, 150, 299]) {
      for (const k of [0, 1]) {
        const plus = points.slice()
        const minus = points.slice()
        plus[2 * i + k] += h
        minus[2 * i + k] -= h
        const fd = -(pairSum({ N, d: 2, points: plus }, { name: 'log' }, free2) - pairSum({ N, d: 2, points: minus }, { name: 'log' }, free2)) / (2 * h)
        expect(Math.abs(f.force[2 * i + k] - fd)).toBeLessThanOrEqual(1e-5 * Math.max(1, Math.abs(fd)))
      }
    }
  })
})

describe('2-D log FMM input errors', () => {
  it('names coincident points, non-finite coordinates and bad options', () => {
    const points = uniform(500, 2, 9)
    points[2 * 321] = points[2 * 12]
    points[2 * 321 + 1] = points[2 * 12 + 1]
    expect(() => fmm2dEnergy(points)).toThrow(EngineInputError)
    try {
      fmm2dEnergy(points)
    }
    catch (e) {
      expect((e as EngineInputError).where.indices).toEqual([12, 321])
    }
    expect(() => fmm2dFields(points)).toThrow(/12 and 321 coincide/)
    const bad = uniform(10, 2, 1)
    bad[5] = Infinity
    expect(() => fmm2dEnergy(bad)).toThrow(/point 2/)
    expect(() => fmm2dEnergy(uniform(10, 2, 1), { tolerance: 0 })).toThrow(EngineInputError)
    expect(() => fmm2dEnergy(uniform(10, 2, 1), { theta: 1 })).toThrow(EngineInputError)
    expect(() => fmm2dEnergy(uniform(10, 2, 1), { leafSize: 0 })).toThrow(EngineInputError)
  })
})
