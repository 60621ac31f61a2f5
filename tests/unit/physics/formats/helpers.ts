// Helpers shared by the format tests.
import { EngineInputError } from '../../../../shared/physics/errors'
import type { PointEnsemble } from '../../../../shared/physics/formats/ensemble'
import type { Configuration } from '../../../../shared/physics/types'

/** Runs fn and returns the EngineInputError it throws (fails the test if it throws nothing or something else). */
export function failure(fn: () => unknown): EngineInputError {
  try {
    fn()
  }
  catch (error) {
    if (error instanceof EngineInputError) return error
    throw error
  }
  throw new Error('expected an EngineInputError, but nothing was thrown')
}

/** 1-based line and column of character index `at` in `text`, counted independently of the readers. */
export function lineColumnOf(text: string, at: number): { line: number, column: number } {
  const before = text.slice(0, at).split('\n')
  return { line: before.length, column: before[before.length - 1].length + 1 }
}

/** The 64-bit patterns of the doubles, as hex strings (distinguishes −0 from 0 and NaN payloads). */
export function bitsOf(values: Float64Array): string[] {
  const view = new DataView(values.buffer, values.byteOffset, values.byteLength)
  const out: string[] = []
  for (let i = 0; i < values.length; i++) out.push(view.getBigUint64(8 * i, true).toString(16).padStart(16, '0'))
  return out
}

/** Seeded xorshift128+ (Vigna 2017): random 64-bit patterns turned into finite doubles, plus edge values. */
export function trickyDoubles(count: number, seed: number): Float64Array {
  let s0 = BigInt(seed) | 1n
  let s1 = 0x9e3779b97f4a7c15n ^ BigInt(seed)
  const mask = (1n << 64n) - 1n
  const next = (): bigint => {
    let x = s0
    const y = s1
    s0 = y
    x = (x ^ (x << 23n)) & mask
    s1 = x ^ y ^ (x >> 17n) ^ (y >> 26n)
    return (s1 + y) & mask
  }
  // IEEE 754 edge cases: ±0, the smallest subnormal, the largest subnormal, the smallest normal,
  // the largest finite double, 1 + 2^−52 (common practice).
  const edges = [0, -0, 5e-324, -5e-324, 2.225073858507201e-308, 2.2250738585072014e-308, 1e308, -1e308, Number.MAX_VALUE, 1 + 2 ** -52, 0.1, 1 / 3, Math.PI]
  const out = new Float64Array(count)
  const view = new DataView(out.buffer)
  for (let i = 0; i < count; i++) {
    if (i < edges.length) {
      out[i] = edges[i]
      continue
    }
    let bits = next()
    // Keep the value finite: force the exponent away from all ones.
    if (((bits >> 52n) & 0x7ffn) === 0x7ffn) bits ^= 1n << 62n
    view.setBigUint64(8 * i, bits, true)
  }
  return out
}

export function ensembleOf(configurations: Configuration[], labels?: PointEnsemble['labels']): PointEnsemble {
  return {
    d: configurations[0].d,
    configurations,
    labels: labels ?? configurations.map(() => ({})),
    format: 'json',
    warnings: [],
  }
}

export function configurationOf(d: number, values: ArrayLike<number>): Configuration {
  return { N: values.length / d, d, points: Float64Array.from(values) }
}
