import { describe, it, expect } from 'vitest'
import {
  CANONICAL_CONVENTION,
  allConventions,
  conventionLabel,
  convertBeta,
  convertEnergy,
  energyInConvention,
  fieldFactor,
  gibbsEquivalent,
  gibbsFactor,
  pairFactor,
  sameConvention,
  signFactor,
  validateConvention,
} from '../../../shared/physics/conventions'
import type { EnergyConvention } from '../../../shared/physics/conventions'
import { EngineInputError } from '../../../shared/physics/errors'

// Tiny LCG for test inputs only (common practice).
function lcg(seed: number): () => number {
  let s = seed >>> 0
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0
    return s / 4294967296
  }
}

function close(a: number, b: number, rel = 1e-12): boolean {
  return Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b))
}

// The Gibbs exponent −σ w(β) H_conv of a record (its density is e^{exponent}).
function exponent(conv: EnergyConvention, beta: number, H: number, N: number, d: number): number {
  return -signFactor(conv) * gibbsFactor(conv, N, d) * beta * H
}

describe('convention records', () => {
  it('has the canonical record of this engine (Σ_{i≠j} g + N Σ V, −log, e^{−βH/2})', () => {
    expect(CANONICAL_CONVENTION).toEqual({ pairs: 'full', fieldScale: 'N', logSign: 'minus-log', gibbs: 'beta/2' })
  })

  it('lists 36 distinct records, each accepted by the validator', () => {
    const all = allConventions()
    expect(all).toHaveLength(36)
    for (let i = 0; i < all.length; i++) {
      expect(validateConvention(JSON.parse(JSON.stringify(all[i])))).toEqual(all[i])
      for (let j = i + 1; j < all.length; j++) expect(sameConvention(all[i], all[j])).toBe(false)
    }
  })

  it('rejects bad records, naming the field', () => {
    const good = { ...CANONICAL_CONVENTION }
    expect(() => validateConvention(null)).toThrow(EngineInputError)
    expect(() => validateConvention({ ...good, pairs: 'twice' })).toThrow(/pairs/)
    expect(() => validateConvention({ ...good, fieldScale: 2 })).toThrow(/fieldScale/)
    expect(() => validateConvention({ ...good, fieldScale: '1' })).toThrow(/fieldScale/)
    expect(() => validateConvention({ ...good, logSign: 'log' })).toThrow(/logSign/)
    expect(() => validateConvention({ ...good, gibbs: 'beta*N' })).toThrow(/gibbs/)
    expect(() => validateConvention({ ...good, extra: 1 })).toThrow(/extra/)
    expect(() => validateConvention({ pairs: 'full' }, 'ensemble 3')).toThrow(/ensemble 3\.fieldScale/)
  })

  it('labels a record in words and formulas', () => {
    expect(conventionLabel(CANONICAL_CONVENTION)).toBe('Σ_{i≠j} −log|x_i−x_j| + N Σ V(x_i); weight e^{−βH/2}')
    expect(conventionLabel({ pairs: 'half', fieldScale: 1, logSign: 'plus-log', gibbs: 'beta' })).toBe('½Σ_{i≠j} log|x_i−x_j| − Σ V(x_i); weight e^{+βH}')
    expect(conventionLabel({ pairs: 'half', fieldScale: 'N/2', logSign: 'minus-log', gibbs: 'beta N^(2/d-1)/2' }, { name: 'coulomb' }, 3))
      .toBe('½Σ_{i≠j} |x_i−x_j|^(-1) + (N/2) Σ V(x_i); weight e^{−βN^{2/d−1}H/2}')
  })
})

describe('energies in a convention', () => {
  it('writes the canonical energy as Σ_{i≠j} g + N Σ V and applies the factors', () => {
    const parts = { pairSumOrdered: 3.5, confinement: -1.25, N: 10, d: 2 }
    expect(energyInConvention(parts)).toBe(3.5 + 10 * -1.25)
    expect(energyInConvention(parts, { pairs: 'half', fieldScale: 'N/2', logSign: 'minus-log', gibbs: 'beta' })).toBe(1.75 + 5 * -1.25)
    expect(energyInConvention(parts, { pairs: 'half', fieldScale: 1, logSign: 'plus-log', gibbs: 'beta' })).toBe(-(1.75 - 1.25))
  })

  it('refuses plus-log for kernels other than log', () => {
    const parts = { pairSumOrdered: 1, confinement: 1, N: 3, d: 3, kernel: { name: 'coulomb' as const } }
    expect(() => energyInConvention(parts, { ...CANONICAL_CONVENTION, logSign: 'plus-log' })).toThrow(/plus-log/)
    expect(energyInConvention(parts)).toBe(4)
  })

  it('converts between every pair of records and back, given one part (random parts)', () => {
    const rand = lcg(42)
    const all = allConventions()
    for (const from of all) {
      for (const to of all) {
        const N = 2 + Math.floor(rand() * 500)
        const d = 1 + Math.floor(rand() * 3)
        const S = (rand() - 0.3) * 1e4 // Σ_{i≠j} g
        const C = (rand() - 0.2) * 1e2 // Σ V
        const parts = { pairSumOrdered: S, confinement: C, N, d }
        const Hf = energyInConvention(parts, from)
        const Ht = energyInConvention(parts, to)
        const viaPairs = convertEnergy(Hf, from, to, { N, d, pairSum: S / 2 })
        const viaField = convertEnergy(Hf, from, to, { N, d, confinement: C })
        const viaBoth = convertEnergy(Hf, from, to, { N, d, pairSum: S / 2, confinement: C })
        expect(close(viaPairs, Ht)).toBe(true)
        expect(close(viaField, Ht)).toBe(true)
        expect(close(viaBoth, Ht)).toBe(true)
        expect(close(convertEnergy(viaPairs, to, from, { N, d, pairSum: S / 2 }), Hf)).toBe(true)
      }
    }
  })

  it('converts H alone exactly when the field has the same weight relative to the pairs, and refuses otherwise', () => {
    const rand = lcg(5)
    const all = allConventions()
    let allowed = 0
    let refused = 0
    for (const from of all) {
      for (const to of all) {
        const N = 7
        const d = 2
        const S = (rand() - 0.5) * 100
        const C = (rand() - 0.5) * 10
        const parts = { pairSumOrdered: S, confinement: C, N, d }
        const Hf = energyInConvention(parts, from)
        const ratioF = fieldFactor(from, N) / pairFactor(from)
        const ratioT = fieldFactor(to, N) / pairFactor(to)
        if (ratioF === ratioT) {
          allowed++
          expect(close(convertEnergy(Hf, from, to, { N, d }), energyInConvention(parts, to))).toBe(true)
        }
        else {
          refused++
          expect(() => convertEnergy(Hf, from, to, { N, d })).toThrow(EngineInputError)
        }
        // V = 0: always convertible from H alone
        const H0 = energyInConvention({ ...parts, confinement: 0 }, from)
        expect(close(convertEnergy(H0, from, to, { N, d, confinement: 0 }), energyInConvention({ ...parts, confinement: 0 }, to))).toBe(true)
      }
    }
    expect(allowed).toBeGreaterThan(0)
    expect(refused).toBeGreaterThan(0)
  })

  it('names the missing information and checks parts against H', () => {
    const half = { pairs: 'half', fieldScale: 1, logSign: 'minus-log', gibbs: 'beta' } as const
    expect(() => convertEnergy(10, CANONICAL_CONVENTION, half, { N: 4, d: 2 })).toThrow(/pair sum or the confinement/)
    expect(() => convertEnergy(10, CANONICAL_CONVENTION, half, { N: 4, d: 2, pairSum: 1, confinement: 1 })).toThrow(/does not match/)
    // N = 1: no pairs, so H alone suffices: H = N·V(x_1) = V, and in 'half, 1' also V
    expect(convertEnergy(2.5, CANONICAL_CONVENTION, half, { N: 1, d: 2 })).toBe(2.5)
  })
})

describe('β between conventions', () => {
  it('keeps the Gibbs exponent when the records weight the field alike (all such pairs, random energies)', () => {
    const rand = lcg(11)
    const all = allConventions()
    for (const from of all) {
      for (const to of all) {
        const N = 3 + Math.floor(rand() * 1000)
        const d = 1 + Math.floor(rand() * 3)
        const beta = 0.1 + 5 * rand()
        const S = (rand() - 0.5) * 1e3
        const C = rand() * 50
        const parts = { pairSumOrdered: S, confinement: C, N, d }
        const Hf = energyInConvention(parts, from)
        const Ht = energyInConvention(parts, to)
        const eq = gibbsEquivalent(beta, from, to, { N, d })
        if (Math.abs(eq.potentialScale - 1) < 1e-15) {
          const b2 = convertBeta(beta, from, to, { N, d })
          expect(close(exponent(from, beta, Hf, N, d), exponent(to, b2, Ht, N, d))).toBe(true)
          expect(close(convertBeta(b2, to, from, { N, d }), beta)).toBe(true)
        }
        else {
          expect(() => convertBeta(beta, from, to, { N, d })).toThrow(/potential must also be multiplied/)
          // with V rescaled by potentialScale the exponents agree
          const HtScaled = energyInConvention({ ...parts, confinement: C * eq.potentialScale }, to)
          expect(close(exponent(from, beta, Hf, N, d), exponent(to, eq.beta, HtScaled, N, d))).toBe(true)
        }
      }
    }
  })

  it('maps the canonical β to the e^{−βH} record with halved pairs (same measure, same β)', () => {
    // e^{−(β/2)(Σ_{i≠j} g + NΣV)} = e^{−β(Σ_{i<j} g + (N/2)ΣV)}: a standard rewriting (common practice)
    const to = { pairs: 'half', fieldScale: 'N/2', logSign: 'minus-log', gibbs: 'beta' } as const
    expect(convertBeta(2, CANONICAL_CONVENTION, to, { N: 100, d: 2 })).toBe(2)
    // β N^{2/d−1}/2 in d = 1 is βN/2: β' = β/N
    const scaled = { ...CANONICAL_CONVENTION, gibbs: 'beta N^(2/d-1)/2' } as const
    expect(convertBeta(2, CANONICAL_CONVENTION, scaled, { N: 100, d: 1 })).toBeCloseTo(0.02, 15)
    expect(() => convertBeta(-1, CANONICAL_CONVENTION, to, { N: 3, d: 2 })).toThrow(/β must be/)
  })
})
