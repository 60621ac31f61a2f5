import { describe, it, expect } from 'vitest'
import { sha256Hex, configurationChecksum, configurationBytes, ensembleChecksum } from '../../../../shared/physics/formats/hash'
import { readEnsemble } from '../../../../shared/physics/formats/read'
import { writeCsv, writeJson } from '../../../../shared/physics/formats/write'
import { writeNpy } from '../../../../shared/physics/formats/npy'
import { configurationOf, ensembleOf, trickyDoubles } from './helpers'

const enc = (s: string): Uint8Array => new TextEncoder().encode(s)

describe('sha256Hex', () => {
  it('matches the FIPS 180-2 test vectors', async () => {
    // FIPS 180-2, Appendix B.1: the one-block message "abc".
    expect(await sha256Hex(enc('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad')
    // FIPS 180-2, Appendix B.2: the two-block message below.
    expect(await sha256Hex(enc('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'))).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1')
  })

  it('hashes only the bytes of a view, not the rest of its buffer', async () => {
    const big = enc('xxabcyy')
    expect(await sha256Hex(big.subarray(2, 5))).toBe(await sha256Hex(enc('abc')))
  })
})

describe('configurationChecksum', () => {
  it('is the SHA-256 of uint32 LE d, uint32 LE N and the float64 LE coordinates', async () => {
    // d = 2, N = 1, point (1, −2); binary64 LE bytes of 1 and −2 (IEEE 754, common practice).
    const hand = new Uint8Array([2, 0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0xf0, 0x3f, 0, 0, 0, 0, 0, 0, 0, 0xc0])
    const c = configurationOf(2, [1, -2])
    expect(Array.from(configurationBytes(c))).toEqual(Array.from(hand))
    expect(await configurationChecksum(c)).toBe(await sha256Hex(hand))
  })

  it('is the same whichever file format the points came from', async () => {
    const points = trickyDoubles(300, 3)
    const e = ensembleOf([{ N: 100, d: 3, points }])
    const sums = await Promise.all([
      readEnsemble(writeCsv(e), 'a.csv'),
      readEnsemble(writeJson(e), 'a.json'),
      readEnsemble(writeNpy(e), 'a.npy'),
    ].map(back => configurationChecksum(back.configurations[0])))
    expect(new Set(sums).size).toBe(1)
    expect(sums[0]).toBe(await configurationChecksum(e.configurations[0]))
  })

  it('changes when one bit, the sign of zero, or the split into N and d changes', async () => {
    const base = await configurationChecksum(configurationOf(2, [0, 1, 2, 3, 4, 5]))
    expect(await configurationChecksum(configurationOf(3, [0, 1, 2, 3, 4, 5]))).not.toBe(base)
    expect(await configurationChecksum(configurationOf(2, [-0, 1, 2, 3, 4, 5]))).not.toBe(base)
    expect(await configurationChecksum(configurationOf(2, [0, 1, 2, 3, 4, 5 + 2 ** -50]))).not.toBe(base)
  })

  it('ensembleChecksum depends on how points are split into configurations', async () => {
    const one = ensembleOf([configurationOf(1, [1, 2])])
    const two = ensembleOf([configurationOf(1, [1]), configurationOf(1, [2])])
    expect(await ensembleChecksum(one)).not.toBe(await ensembleChecksum(two))
    expect(await ensembleChecksum(two)).toBe(await ensembleChecksum(ensembleOf([configurationOf(1, [1]), configurationOf(1, [2])])))
  })
})
