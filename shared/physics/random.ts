// Seeded random numbers for the samplers. One generator type, xoroshiro128+ (Blackman & Vigna,
// "Scrambled linear pseudorandom number generators", ACM Trans. Math. Softw. 47, 2021), taken from the
// pure-rand package and always passed explicitly; nothing here reads a clock or Math.random.
// - seeds: a number or a string is hashed (the 32-bit finaliser of MurmurHash3, used as a splitting mixer
//   as in Steele, Lea & Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014) into the
//   128-bit state, so that every seed gives the same stream on every platform;
// - uniform(): 53 random bits from two 32-bit outputs, u = (a·2^26 + b)/2^53 ∈ [0, 1) (common practice);
// - normal(): Marsaglia's polar method (Marsaglia & Bray, SIAM Review 6, 1964), the second variate of
//   each pair kept for the next call (part of the state);
// - gamma(k): Marsaglia & Tsang, "A simple method for generating gamma variables", ACM TOMS 26 (2000),
//   with the boost Gamma(k) = Gamma(k + 1)·U^{1/k} for k < 1 (same paper);
// - chi(k) = √(2·Gamma(k/2)) (the χ distribution with k degrees of freedom, k > 0 real);
// - jump(): advances by 2^64 outputs (the jump polynomial of xoroshiro128+), so split(i) gives
//   non-overlapping streams for workers;
// - state()/fromState(): the whole state as plain numbers, to resume a run exactly.
import { xoroshiro128plusFromState } from 'pure-rand/generator/xoroshiro128plus'
import type { JumpableRandomGenerator } from 'pure-rand/types/JumpableRandomGenerator'
import { EngineInputError } from './errors'

/** The serialisable state of an Rng (JSON-safe). */
export interface RngState {
  readonly algorithm: 'xoroshiro128+'
  /** The four 32-bit words of the generator. */
  readonly words: [number, number, number, number]
  /** A normal variate kept from the last pair of the polar method, or null. */
  readonly spareNormal: number | null
}

function fmix32(h: number): number {
  h ^= h >>> 16
  h = Math.imul(h, 0x85ebca6b)
  h ^= h >>> 13
  h = Math.imul(h, 0xc2b2ae35)
  h ^= h >>> 16
  return h | 0
}

/** The 32-bit words that identify a seed: a tag, then the seed's own words. */
function seedWords(seed: number | string): number[] {
  if (typeof seed === 'number') {
    if (!Number.isFinite(seed)) throw new EngineInputError(`the seed must be a finite number or a string (got ${seed})`)
    const view = new DataView(new ArrayBuffer(8))
    view.setFloat64(0, seed === 0 ? 0 : seed) // −0 and 0 are the same seed
    return [0x6e756d62, view.getInt32(0), view.getInt32(4)]
  }
  if (typeof seed !== 'string') throw new EngineInputError('the seed must be a finite number or a string')
  const words = [0x73747269, seed.length]
  for (let i = 0; i < seed.length; i++) words.push(seed.charCodeAt(i))
  return words
}

function stateFromSeed(seed: number | string): number[] {
  const words = seedWords(seed)
  let h = 0x243f6a88
  for (const w of words) h = fmix32(h ^ fmix32(w + 0x9e3779b9))
  const out: number[] = []
  for (let k = 0; k < 4; k++) {
    h = (h + 0x9e3779b9) | 0
    out.push(fmix32(h ^ Math.imul(k + 1, 0x632be5ab)))
  }
  if (!out.some(w => w !== 0)) out[0] = 1 // the all-zero state is a fixed point of the generator
  return out
}

const TWO_POW_26 = 67108864
const TWO_POW_53 = 9007199254740992

/** A seeded generator of uniform, normal, gamma and chi variates. */
export class Rng {
  private spare: number | null

  private constructor(private readonly gen: JumpableRandomGenerator, spare: number | null) {
    this.spare = spare
  }

  /** @internal use createRng or Rng.fromState */
  static wrap(gen: JumpableRandomGenerator, spare: number | null): Rng {
    return new Rng(gen, spare)
  }

  /** A uniform variate in [0, 1) with 53 random bits. */
  uniform(): number {
    const a = this.gen.next() >>> 5
    const b = this.gen.next() >>> 6
    return (a * TWO_POW_26 + b) / TWO_POW_53
  }

  /** A uniform variate in (0, 1) (never 0), for logarithms. */
  uniformPositive(): number {
    let u = this.uniform()
    while (u === 0) u = this.uniform()
    return u
  }

  /** A uniform integer in {0, …, n − 1} (n ≤ 2^53) by rejection of the top of the range. */
  integer(n: number): number {
    if (!Number.isInteger(n) || n < 1 || n > TWO_POW_53) throw new EngineInputError(`integer(n): n must be an integer from 1 to 2^53 (got ${n})`)
    const limit = Math.floor(TWO_POW_53 / n) * n
    for (;;) {
      const v = this.uniform() * TWO_POW_53
      if (v < limit) return v % n
    }
  }

  /** A standard normal variate (Marsaglia's polar method). */
  normal(): number {
    if (this.spare !== null) {
      const z = this.spare
      this.spare = null
      return z
    }
    for (;;) {
      const u = 2 * this.uniform() - 1
      const v = 2 * this.uniform() - 1
      const s = u * u + v * v
      if (s > 0 && s < 1) {
        const f = Math.sqrt((-2 * Math.log(s)) / s)
        this.spare = v * f
        return u * f
      }
    }
  }

  /** A Gamma(shape, 1) variate, shape > 0 (Marsaglia & Tsang 2000); shape 0 gives 0. */
  gamma(shape: number): number {
    if (!(shape >= 0) || !Number.isFinite(shape)) throw new EngineInputError(`gamma(shape): the shape must be a finite number ≥ 0 (got ${shape})`)
    if (shape === 0) return 0
    if (shape < 1) {
      const g = this.gamma(shape + 1)
      return g * Math.pow(this.uniformPositive(), 1 / shape)
    }
    const d = shape - 1 / 3
    const c = 1 / Math.sqrt(9 * d)
    for (;;) {
      let x: number
      let v: number
      do {
        x = this.normal()
        v = 1 + c * x
      } while (v <= 0)
      v = v * v * v
      const u = this.uniformPositive()
      const x2 = x * x
      if (u < 1 - 0.0331 * x2 * x2) return d * v
      if (Math.log(u) < 0.5 * x2 + d * (1 - v + Math.log(v))) return d * v
    }
  }

  /** A χ_k variate, √(2·Gamma(k/2)), for any real k ≥ 0 (χ_0 = 0). */
  chi(k: number): number {
    if (!(k >= 0) || !Number.isFinite(k)) throw new EngineInputError(`chi(k): the degrees of freedom must be a finite number ≥ 0 (got ${k})`)
    return Math.sqrt(2 * this.gamma(k / 2))
  }

  /** Advances this generator by 2^64 outputs (drops a kept normal variate). */
  jump(): this {
    this.gen.jump()
    this.spare = null
    return this
  }

  /** An independent stream number i ≥ 0: a copy of this generator jumped i + 1 times (this one is unchanged). */
  split(i: number): Rng {
    if (!Number.isInteger(i) || i < 0 || i > 1e6) throw new EngineInputError(`split(i): i must be an integer from 0 to 10^6 (got ${i})`)
    const copy = new Rng(this.gen.clone(), null)
    for (let k = 0; k <= i; k++) copy.gen.jump()
    return copy
  }

  /** An exact copy (same future numbers). */
  clone(): Rng {
    return new Rng(this.gen.clone(), this.spare)
  }

  /** The whole state, JSON-safe. */
  state(): RngState {
    const w = this.gen.getState()
    return { algorithm: 'xoroshiro128+', words: [w[0] | 0, w[1] | 0, w[2] | 0, w[3] | 0], spareNormal: this.spare }
  }

  /** A generator that continues exactly from a saved state. */
  static fromState(state: RngState): Rng {
    return rngFromState(state)
  }
}

/** A generator seeded by a number or a string; the same seed gives the same numbers everywhere. */
export function createRng(seed: number | string): Rng {
  return Rng.wrap(xoroshiro128plusFromState(stateFromSeed(seed)), null)
}

/** Checks a saved state (e.g. parsed JSON) and rebuilds the generator. */
export function rngFromState(state: unknown): Rng {
  if (typeof state !== 'object' || state === null) throw new EngineInputError('the random-number state must be an object { algorithm, words, spareNormal }')
  const s = state as Record<string, unknown>
  if (s.algorithm !== 'xoroshiro128+') throw new EngineInputError(`the random-number state has algorithm ${JSON.stringify(s.algorithm)}, expected "xoroshiro128+"`)
  const words = s.words
  if (!Array.isArray(words) || words.length !== 4 || !words.every(w => Number.isInteger(w) && w >= -2147483648 && w <= 4294967295)) {
    throw new EngineInputError('the random-number state needs words: four 32-bit integers')
  }
  if (words.every(w => (w | 0) === 0)) throw new EngineInputError('the random-number state is all zero, which xoroshiro128+ cannot leave')
  const spare = s.spareNormal
  if (spare !== null && spare !== undefined && !(typeof spare === 'number' && Number.isFinite(spare))) throw new EngineInputError('the random-number state has a spareNormal that is not a finite number or null')
  return Rng.wrap(xoroshiro128plusFromState(words.map(w => (w as number) | 0)), typeof spare === 'number' ? spare : null)
}
