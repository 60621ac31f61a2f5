import { describe, it, expect } from 'vitest'
import { CompensatedSum, blockedPairSum, compensatedSum } from '../../../shared/physics/summation'

// Tiny LCG for test inputs only (Numerical Recipes constants; common practice).
function lcg(seed: number): () => number {
  let s = seed >>> 0
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0
    return s / 4294967296
  }
}

// The exact sum of doubles as a rational with a power-of-two denominator, rounded once at the end.
function exactSum(values: number[]): number {
  const SHIFT = 1100n
  let total = 0n
  for (const v of values) {
    if (v === 0) continue
    const buf = new DataView(new ArrayBuffer(8))
    buf.setFloat64(0, v)
    const bits = buf.getBigUint64(0)
    const sign = bits >> 63n ? -1n : 1n
    const exp = Number((bits >> 52n) & 0x7ffn)
    let mant = bits & ((1n << 52n) - 1n)
    let e: number
    if (exp === 0) e = -1074
    else {
      mant |= 1n << 52n
      e = exp - 1075
    }
    total += sign * (mant << BigInt(e + Number(SHIFT)))
  }
  // total / 2^SHIFT, converted with enough precision
  const neg = total < 0n
  let t = neg ? -total : total
  let scale = -Number(SHIFT)
  while (t >= 1n << 64n) {
    t >>= 1n
    scale++
  }
  const out = Number(t) * Math.pow(2, scale)
  return neg ? -out : out
}

describe('compensated summation', () => {
  it('keeps the small terms that a plain sum loses (Neumaier 1974 example)', () => {
    const values = [1, 1e100, 1, -1e100]
    // exact value 2 by hand; the plain left-to-right sum gives 0
    expect(values.reduce((a, b) => a + b, 0)).toBe(0)
    expect(compensatedSum(values)).toBe(2)
  })

  it('matches the exact sum of ill-conditioned random data to a few ulps, in any order', () => {
    const rand = lcg(7)
    const values: number[] = []
    for (let i = 0; i < 2000; i++) values.push((rand() - 0.5) * Math.pow(10, Math.floor(rand() * 16) - 8))
    const exact = exactSum(values)
    const scale = values.reduce((a, b) => a + Math.abs(b), 0)
    const forward = compensatedSum(values)
    expect(Math.abs(forward - exact)).toBeLessThanOrEqual(4 * Number.EPSILON * Math.abs(exact) + 1e-30 * scale)
    for (let trial = 0; trial < 5; trial++) {
      const shuffled = values.slice()
      for (let i = shuffled.length - 1; i > 0; i--) {
        const j = Math.floor(rand() * (i + 1))
        const tmp = shuffled[i]
        shuffled[i] = shuffled[j]
        shuffled[j] = tmp
      }
      const v = compensatedSum(shuffled)
      expect(Math.abs(v - exact)).toBeLessThanOrEqual(4 * Number.EPSILON * Math.abs(exact))
    }
  })

  it('combines accumulators without losing their corrections', () => {
    const a = new CompensatedSum().add(1e16).add(1)
    const b = new CompensatedSum().add(-1e16).add(1)
    expect(a.addSum(b).value).toBe(2)
  })
})

describe('blocked pair sums', () => {
  it('visits every pair i < j exactly once across block boundaries', () => {
    for (const n of [0, 1, 2, 127, 128, 129, 300]) {
      const seen = new Set<number>()
      const total = blockedPairSum(n, (i, j) => {
        expect(i).toBeLessThan(j)
        seen.add(i * 1000 + j)
        return i + 2 * j
      })
      expect(seen.size).toBe(n < 2 ? 0 : (n * (n - 1)) / 2)
      // Σ_{i<j} (i + 2j) in closed form: Σ_j [j(j−1)/2 + 2j·j]
      let expected = 0
      for (let j = 0; j < n; j++) expected += (j * (j - 1)) / 2 + 2 * j * j
      expect(total).toBe(expected)
    }
  })
})
