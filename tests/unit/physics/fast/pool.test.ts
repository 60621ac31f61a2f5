import { describe, it, expect, afterAll } from 'vitest'
import type { Kernel } from '../../../../shared/physics/types'
import { pairSum } from '../../../../shared/physics/energy'
import { EngineInputError } from '../../../../shared/physics/errors'
import { wasmPairSum } from '../../../../shared/physics/fast/wasm'
import { balancedRowBlocks, pairsBefore } from '../../../../shared/physics/fast/chunks'
import { PairPool, fastPairSum } from '../../../../server/engine/pool'
import { clustered, relErr, uniform } from './configurations'

const one = new PairPool({ threads: 1 })
const two = new PairPool({ threads: 2 })
const three = new PairPool({ threads: 3 })

afterAll(async () => {
  await Promise.all([one.close(), two.close(), three.close()])
})

describe('balanced row blocks of the triangular sum', () => {
  it('cover the rows in order and hold nearly equal numbers of pairs', () => {
    for (const N of [1, 33, 1000, 20001]) {
      const b = balancedRowBlocks(N)
      expect(b[0]).toBe(0)
      expect(b[b.length - 1]).toBe(N)
      for (let k = 1; k < b.length; k++) expect(b[k]).toBeGreaterThan(b[k - 1])
      if (N > 1000) {
        const K = b.length - 1
        const total = pairsBefore(N, N)
        for (let k = 0; k < K; k++) {
          const pairs = pairsBefore(N, b[k + 1]) - pairsBefore(N, b[k])
          // rounding the boundaries to multiples of 4 rows moves at most 4(N − 1) pairs
          expect(Math.abs(pairs - total / K)).toBeLessThanOrEqual(8 * N)
        }
      }
    }
  })
})

describe('worker pool', () => {
  it('gives the same value to the bit for 1, 2 and 3 workers, equal to the single-thread kernel', async () => {
    for (const kernel of [{ name: 'log' }, { name: 'riesz', s: 1 }, { name: 'riesz', s: 0.3 }] as Kernel[]) {
      const points = clustered(6001, 2, 4)
      const a = await one.pairSum(points, 2, kernel, { kind: 'free', d: 2 })
      const b = await two.pairSum(points, 2, kernel, { kind: 'free', d: 2 })
      const c = await three.pairSum(points, 2, kernel, { kind: 'free', d: 2 })
      expect(b.method).toBe('wasm-simd')
      expect(b.threads).toBe(2)
      expect(b.value).toBe(a.value)
      expect(c.value).toBe(a.value)
      expect(a.value).toBe(wasmPairSum(points, 2, kernel, { kind: 'free', d: 2 }))
      expect(relErr(a.value, pairSum({ N: 6001, d: 2, points }, kernel, { kind: 'free', d: 2 }))).toBeLessThanOrEqual(1e-13)
      expect(b.pairsPerSecond).toBeGreaterThan(0)
    }
  }, 30_000)

  it('is reproducible run to run', async () => {
    const points = uniform(3000, 3, 8)
    const r1 = await two.pairSum(points, 3, { name: 'coulomb' }, { kind: 'free', d: 3 })
    const r2 = await two.pairSum(points, 3, { name: 'coulomb' }, { kind: 'free', d: 3 })
    expect(r2.value).toBe(r1.value)
  })

  it('computes the same potentials and forces with 1 and 2 workers', async () => {
    const points = uniform(2001, 2, 12)
    const a = await one.fields(points, 2)
    const b = await two.fields(points, 2)
    expect(Array.from(b.potential)).toEqual(Array.from(a.potential))
    expect(Array.from(b.force)).toEqual(Array.from(a.force))
  })

  it('reports coincident points from a worker with both indices', async () => {
    const points = uniform(500, 2, 3)
    points[2 * 400] = points[2 * 7]
    points[2 * 400 + 1] = points[2 * 7 + 1]
    await expect(two.pairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 })).rejects.toBeInstanceOf(EngineInputError)
    await expect(two.pairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 })).rejects.toMatchObject({ where: { indices: [7, 400] } })
  })

  it('fastPairSum runs on the default pool and on a pool of a requested size', async () => {
    const points = uniform(800, 2, 2)
    const expected = pairSum({ N: 800, d: 2, points }, { name: 'log' }, { kind: 'free', d: 2 })
    const a = await fastPairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 })
    const b = await fastPairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 }, { threads: 1 })
    expect(a.value).toBe(b.value)
    expect(relErr(a.value, expected)).toBeLessThanOrEqual(1e-13)
    expect(a.engineVersion).toMatch(/\d/)
  })
})
