import { describe, it, expect } from 'vitest'
import { pairSum } from '../../../../shared/physics/energy'
import { EngineInputError } from '../../../../shared/physics/errors'
import { fastEnergy } from '../../../../shared/physics/fast/choose'
import type { NativeLogKernels } from '../../../../shared/physics/fast/native'
import { nativeLogKernels, nativeLogSquaredSum } from '../../../../shared/physics/fast/native'
import { wasmPairSum } from '../../../../shared/physics/fast/wasm'
import { clustered, lattice, relErr, sphere, uniform } from './configurations'

// npm test builds the addon (scripts/build-native.mjs --required): without it these tests fail.
const kernels = nativeLogKernels() as NativeLogKernels
const widths = ['avx512', 'avx2', 'scalar']
// every kernel this CPU runs: its widest and each narrower one
const isas = kernels ? widths.slice(widths.indexOf(kernels.isa)) : []

function reference(points: Float64Array, d: number): number {
  const geometry = { kind: 'free', d } as const
  return pairSum({ N: points.length / d, d, points }, { name: 'log' }, geometry)
}

/** −½ Σ log r² = Σ −log r, the engine's log pair sum. */
function native(points: Float64Array, d: number, threads?: number, isa?: string): number {
  return -0.5 * nativeLogSquaredSum(kernels, points, d, threads, isa)
}

describe('native direct log kernels', () => {
  it('are built and loaded, with a vector width this CPU runs', () => {
    expect(kernels).toBeDefined()
    expect(widths).toContain(kernels.isa)
    expect(kernels.threads).toBeGreaterThanOrEqual(1)
  })

  for (const isa of ['avx512', 'avx2', 'scalar']) {
    // on a CPU without these lanes the addon takes a narrower kernel, which must be right as well
    it(`${isa}: uniform, clustered and lattice points in d = 1, 2, 3 agree with the TypeScript sum to 1e−13`, () => {
      for (const d of [1, 2, 3]) {
        for (const [name, points] of [['uniform', uniform(1203, d, 5)], ['clustered', clustered(1001, d, 6)], ['lattice', lattice(1000, d, 0.37)]] as const) {
          const got = native(points, d, 2, isa)
          const want = reference(points, d)
          expect(relErr(got, want), `${isa} ${name} d = ${d}`).toBeLessThanOrEqual(1e-13)
        }
      }
    })
  }

  it('gives the value of roots of unity in closed form: Σ_{i<j} −log|ω^i − ω^j| = −(N/2) log N', () => {
    // Π_{j≠i} |ω^i − ω^j| = N for the N-th roots of unity (the derivative of z^N − 1 at ω^i;
    // elementary closed form), so the unordered pair sum of −log|·| is −(N/2) log N.
    for (const N of [4096, 10007]) {
      const points = new Float64Array(2 * N)
      for (let k = 0; k < N; k++) {
        points[2 * k] = Math.cos((2 * Math.PI * k) / N)
        points[2 * k + 1] = Math.sin((2 * Math.PI * k) / N)
      }
      const want = -(N / 2) * Math.log(N)
      for (const isa of isas) expect(Math.abs(native(points, 2, 2, isa) - want) / Math.abs(want)).toBeLessThanOrEqual(1e-12)
    }
  })

  it('takes the careful path for huge coordinates, tiny separations and mixed scales', () => {
    const huge = uniform(700, 2, 9).map(v => v * 1e40)
    const tiny = clustered(700, 2, 10).map((v, k) => (k % 7 === 0 ? v * 1e-45 : v))
    const pairsOfCloseTwins = uniform(600, 3, 11)
    // every tenth point has a twin 1e−60 away near the origin: r² = 1e−120, far below what the fast
    // path multiplies
    for (let i = 10; i < 600; i += 10) {
      pairsOfCloseTwins.set([i * 1e-50, 0.3, 0.7], 3 * (i - 1))
      pairsOfCloseTwins.set([i * 1e-50 + 1e-60, 0.3, 0.7], 3 * i)
    }
    for (const isa of isas) {
      expect(relErr(native(huge, 2, 2, isa), reference(huge, 2))).toBeLessThanOrEqual(1e-13)
      expect(relErr(native(tiny, 2, 2, isa), reference(tiny, 2))).toBeLessThanOrEqual(1e-13)
      expect(relErr(native(pairsOfCloseTwins, 3, 2, isa), reference(pairsOfCloseTwins, 3))).toBeLessThanOrEqual(1e-13)
    }
  })

  it('gives the same value to the bit for 1, 2 and 3 threads, and agrees with the WebAssembly kernels', () => {
    const points = clustered(9001, 2, 12)
    const one = native(points, 2, 1)
    expect(native(points, 2, 2)).toBe(one)
    expect(native(points, 2, 3)).toBe(one)
    expect(relErr(one, wasmPairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 }))).toBeLessThanOrEqual(1e-13)
  })

  it('sum chordal log energies on the sphere through the chooser', () => {
    const points = sphere(3000, 13)
    const r = fastEnergy(points, 3, { name: 'log' }, { kind: 'sphere' })
    expect(r.method).toBe('direct-native')
    expect(r.errorBound).toBe(0)
    expect(r.parameters.isa).toBe(kernels.isa)
    expect(relErr(r.value, pairSum({ N: 3000, d: 3, points }, { name: 'log' }, { kind: 'sphere' }))).toBeLessThanOrEqual(1e-13)
  })

  it('names both indices of coincident points, in whichever block and thread they fall', () => {
    for (const [a, b] of [[3, 4], [7, 4000], [5001, 5999]]) {
      const points = uniform(6000, 2, 14)
      points[2 * b] = points[2 * a]
      points[2 * b + 1] = points[2 * a + 1]
      for (const isa of isas) {
        let error: unknown
        try {
          native(points, 2, 2, isa)
        }
        catch (e) {
          error = e
        }
        expect(error).toBeInstanceOf(EngineInputError)
        expect((error as EngineInputError).where.indices).toEqual([a, b])
      }
    }
  })
})
