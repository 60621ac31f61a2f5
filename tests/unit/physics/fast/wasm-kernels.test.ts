import { describe, it, expect } from 'vitest'
import type { Geometry, Kernel } from '../../../../shared/physics/types'
import { pairSum } from '../../../../shared/physics/energy'
import { EngineInputError } from '../../../../shared/physics/errors'
import { PairKernels, wasmFields, wasmPairSum, wasmSimdAvailable } from '../../../../shared/physics/fast/wasm'
import { directFields } from '../../../../shared/physics/fast/direct'
import { clustered, lattice, relErr, sphere, uniform } from './configurations'

// The SIMD kernels must agree with the compensated TypeScript pair sum (shared/physics/energy.ts) to
// 1e−13 relative: both are compensated sums of the same terms (Neumaier 1974), so only rounding differs.
const cases: Array<{ name: string, d: 1 | 2 | 3, kernel: Kernel, geometry: Geometry }> = [
  { name: 'log d=1', d: 1, kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 } },
  { name: 'log d=2', d: 2, kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 } },
  { name: 'log d=3', d: 3, kernel: { name: 'log' }, geometry: { kind: 'free', d: 3 } },
  { name: 'coulomb d=3', d: 3, kernel: { name: 'coulomb' }, geometry: { kind: 'free', d: 3 } },
  { name: 'riesz s=1 d=2', d: 2, kernel: { name: 'riesz', s: 1 }, geometry: { kind: 'free', d: 2 } },
  { name: 'riesz s=2 d=3', d: 3, kernel: { name: 'riesz', s: 2 }, geometry: { kind: 'free', d: 3 } },
  { name: 'riesz s=0.7 d=1', d: 1, kernel: { name: 'riesz', s: 0.7 }, geometry: { kind: 'free', d: 1 } },
  { name: 'riesz s=3.5 d=3', d: 3, kernel: { name: 'riesz', s: 3.5 }, geometry: { kind: 'free', d: 3 } },
]

describe('SIMD direct pair kernels', () => {
  it('are available in this runtime', () => {
    expect(wasmSimdAvailable()).toBe(true)
  })

  for (const c of cases) {
    it(`${c.name}: random, clustered and lattice points agree with the TypeScript sum to 1e−13`, () => {
      const kernels = new PairKernels()
      for (const N of [2, 3, 5, 8, 131, 1203]) {
        for (const points of [uniform(N, c.d, N), clustered(N, c.d, N + 1), lattice(N, c.d, 0.5)]) {
          const expected = pairSum({ N, d: c.d, points }, c.kernel, c.geometry)
          const got = wasmPairSum(points, c.d, c.kernel, c.geometry, kernels)
          expect(relErr(got, expected)).toBeLessThanOrEqual(1e-13)
        }
      }
    })
  }

  it('sphere kernels (chordal log and riesz) agree with the TypeScript sum', () => {
    const points = sphere(999, 5)
    for (const kernel of [{ name: 'log' }, { name: 'riesz', s: 1 }, { name: 'riesz', s: 0.5 }] as Kernel[]) {
      const expected = pairSum({ N: 999, d: 3, points }, kernel, { kind: 'sphere' })
      expect(relErr(wasmPairSum(points, 3, kernel, { kind: 'sphere' }), expected)).toBeLessThanOrEqual(1e-13)
    }
  })

  it('takes the careful path for huge coordinates and tiny separations', () => {
    const N = 301
    const big = uniform(N, 2, 9).map(v => v * 1e40)
    const tiny = uniform(N, 2, 10).map(v => v * 1e-80)
    for (const points of [big, tiny]) {
      const expected = pairSum({ N, d: 2, points }, { name: 'log' }, { kind: 'free', d: 2 })
      expect(relErr(wasmPairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 }), expected)).toBeLessThanOrEqual(1e-13)
    }
  })

  it('names both indices of coincident points', () => {
    const points = uniform(40, 2, 3)
    points[2 * 31] = points[2 * 17]
    points[2 * 31 + 1] = points[2 * 17 + 1]
    for (const kernel of [{ name: 'log' }, { name: 'riesz', s: 1 }] as Kernel[]) {
      let caught: unknown
      try {
        wasmPairSum(points, 2, kernel, { kind: 'free', d: 2 })
      }
      catch (e) {
        caught = e
      }
      expect(caught).toBeInstanceOf(EngineInputError)
      expect((caught as EngineInputError).where.indices).toEqual([17, 31])
    }
  })

  it('rectangular blocks (the near field of the 2-D FMM) agree with a compensated TypeScript sum to 1e−13', () => {
    // Σ log|x_i − x_j|² over i in [a0, a1), j in [b0, b1) (j > i for equal ranges), summed term by
    // term with Neumaier's compensation (common practice); block shapes cover the 4-row groups, the
    // rows left over and column counts that are not a multiple of 4
    const reference = (P: Float64Array, a0: number, a1: number, b0: number, b1: number): number => {
      let s = 0
      let c = 0
      for (let i = a0; i < a1; i++) {
        for (let j = a0 === b0 ? i + 1 : b0; j < b1; j++) {
          const x = Math.log((P[2 * i] - P[2 * j]) ** 2 + (P[2 * i + 1] - P[2 * j + 1]) ** 2)
          const t = s + x
          c += Math.abs(s) >= Math.abs(x) ? (s - t) + x : (x - t) + s
          s = t
        }
      }
      return s + c
    }
    const kernels = new PairKernels()
    const points = clustered(400, 2, 21)
    // one pair 1e−36 apart (r² below 1e−70): its group must take the careful path and still agree
    points.set([0, 0, 1e-36, 0], 2 * 250)
    kernels.load(points, 2)
    const shapes: Array<[number, number, number, number]> = [
      [0, 1, 1, 2], [0, 3, 3, 4], [0, 4, 4, 9], [0, 7, 7, 14], [10, 23, 10, 23], [30, 157, 200, 331],
      [0, 128, 128, 256], [240, 260, 240, 260], [240, 249, 251, 262], [300, 305, 0, 99], [100, 229, 100, 229],
    ]
    for (const [a0, a1, b0, b1] of shapes) {
      expect(relErr(kernels.blockLog2(a0, a1, b0, b1), reference(points, a0, a1, b0, b1))).toBeLessThanOrEqual(1e-13)
    }
    points[2 * 120] = points[2 * 140]
    points[2 * 120 + 1] = points[2 * 140 + 1]
    kernels.load(points, 2)
    expect(kernels.blockLog2(100, 160, 100, 160)).toBeNaN()
    expect(kernels.coincidence()).toEqual([120, 140])
    expect(kernels.blockLog2(118, 124, 138, 150)).toBeNaN()
    expect(kernels.coincidence()).toEqual([120, 140])
  })

  it('rectangular Coulomb blocks in space (the near field of the 3-D FMM) agree with a compensated TypeScript sum to 1e−13', () => {
    // Σ 1/|x_i − x_j| over the block, term by term with Neumaier's compensation (common practice)
    const reference = (P: Float64Array, a0: number, a1: number, b0: number, b1: number): number => {
      let s = 0
      let c = 0
      for (let i = a0; i < a1; i++) {
        for (let j = a0 === b0 ? i + 1 : b0; j < b1; j++) {
          const x = 1 / Math.hypot(P[3 * i] - P[3 * j], P[3 * i + 1] - P[3 * j + 1], P[3 * i + 2] - P[3 * j + 2])
          const t = s + x
          c += Math.abs(s) >= Math.abs(x) ? (s - t) + x : (x - t) + s
          s = t
        }
      }
      return s + c
    }
    const kernels = new PairKernels()
    const points = clustered(300, 3, 22)
    kernels.load(points, 3)
    for (const [a0, a1, b0, b1] of [[0, 1, 1, 2], [0, 5, 5, 8], [3, 70, 3, 70], [10, 41, 100, 237], [0, 300, 0, 300]]) {
      expect(relErr(kernels.blockCoulomb3(a0, a1, b0, b1), reference(points, a0, a1, b0, b1))).toBeLessThanOrEqual(1e-13)
    }
    points.set(points.subarray(3 * 40, 3 * 41), 3 * 77)
    kernels.load(points, 3)
    expect(kernels.blockCoulomb3(30, 90, 30, 90)).toBeNaN()
    expect(kernels.coincidence()).toEqual([40, 77])
    expect(kernels.blockCoulomb3(35, 45, 70, 81)).toBeNaN()
    expect(kernels.coincidence()).toEqual([40, 77])
  })

  it('rejects a non-finite coordinate with the index of the point', () => {
    const points = uniform(10, 2, 3)
    points[13] = Number.NaN
    expect(() => wasmPairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 })).toThrow(/point 6/)
  })

  it('potentials and forces (log in the plane, 1/r in space) agree with the direct TypeScript fields', () => {
    for (const d of [2, 3] as const) {
      for (const points of [uniform(517, d, 1), clustered(516, d, 2), lattice(400, d)]) {
        const got = wasmFields(points, d)
        const ref = directFields(points, d, d === 2 ? { name: 'log' } : { name: 'coulomb' })
        let fmax = 0
        for (const f of ref.force) fmax = Math.max(fmax, Math.abs(f))
        for (let i = 0; i < ref.potential.length; i++) {
          expect(Math.abs(got.potential[i] - ref.potential[i])).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(ref.potential[i])))
        }
        for (let k = 0; k < ref.force.length; k++) expect(Math.abs(got.force[k] - ref.force[k])).toBeLessThanOrEqual(1e-13 * fmax)
      }
    }
  })
})
