import { describe, it, expect } from 'vitest'
import { readEnsemble, detectFormat } from '../../../../shared/physics/formats/read'
import { writeCsv, writeJson } from '../../../../shared/physics/formats/write'
import { writeNpy } from '../../../../shared/physics/formats/npy'
import { readText } from '../../../../shared/physics/formats/text'
import { readJson } from '../../../../shared/physics/formats/json'
import { formatNumber, parseDecimal } from '../../../../shared/physics/formats/numbers'
import { bitsOf, configurationOf, ensembleOf, failure, trickyDoubles } from './helpers'

const enc = (s: string): Uint8Array => new TextEncoder().encode(s)

describe('number text round trip', () => {
  it('formatNumber then parseDecimal returns the same 64 bits for edge cases and 20 000 random patterns', () => {
    const values = trickyDoubles(20_000, 7)
    const back = new Float64Array(values.length)
    for (let i = 0; i < values.length; i++) {
      const s = formatNumber(values[i])
      back[i] = parseDecimal(s, 0, s.length) ?? Number.NaN
    }
    expect(bitsOf(back)).toEqual(bitsOf(values))
  })

  it('writes −0 as "-0" and the extreme doubles in their shortest form (ECMA-262 Number::toString)', () => {
    expect(formatNumber(-0)).toBe('-0')
    expect(formatNumber(5e-324)).toBe('5e-324')
    expect(formatNumber(1e308)).toBe('1e+308')
    expect(formatNumber(0.1)).toBe('0.1')
  })
})

describe('writer/reader pairs are bit-exact', () => {
  for (const d of [1, 2, 3]) {
    it(`CSV, JSON and NPY with d = ${d}, several configurations`, () => {
      const values = trickyDoubles(600 * d, 100 + d)
      const configs = [0, 1, 2].map(m => ({ N: 200, d, points: values.slice(m * 200 * d, (m + 1) * 200 * d) }))
      const e = ensembleOf(configs, [{ beta: 2, seed: 7 }, { beta: 4, name: 'b' }, {}])
      const fromCsv = readEnsemble(writeCsv(e), 'e.csv')
      const fromJson = readEnsemble(writeJson(e), 'e.json')
      const fromNpy = readEnsemble(writeNpy(e), 'e.npy')
      expect([fromCsv.format, fromJson.format, fromNpy.format]).toEqual(['text', 'json', 'npy'])
      for (const back of [fromCsv, fromJson, fromNpy]) {
        expect(back.d).toBe(d)
        expect(back.configurations.map(c => c.N)).toEqual([200, 200, 200])
        for (let m = 0; m < 3; m++) expect(bitsOf(back.configurations[m].points)).toEqual(bitsOf(configs[m].points))
      }
      expect(fromJson.labels).toEqual(e.labels)
    })
  }

  it('one configuration: CSV has no config column and NPY has shape (N, d)', () => {
    const c = configurationOf(2, [0, -0, 5e-324, 1e308, -1.7976931348623157e308, 2.2250738585072014e-308])
    const csv = writeCsv(ensembleOf([c]))
    // Shortest round-trip forms of the largest finite double and the smallest normal double
    // (ECMA-262 Number::toString; IEEE 754 binary64 limits, common practice).
    expect(csv).toBe('x,y\n0,-0\n5e-324,1e+308\n-1.7976931348623157e+308,2.2250738585072014e-308\n')
    const npy = writeNpy(c)
    expect(String.fromCharCode(...npy.subarray(10, 70))).toContain('\'shape\': (3, 2)')
    for (const back of [readText(csv, 'c.csv'), readEnsemble(npy, 'c.npy'), readJson(writeJson(ensembleOf([c])), 'c.json')]) {
      expect(bitsOf(back.configurations[0].points)).toEqual(bitsOf(c.points))
    }
  })

  it('configurations of different sizes round-trip through CSV and JSON', () => {
    const e = ensembleOf([configurationOf(3, [1, 0, 0]), configurationOf(3, [0, 1, 0, 0, 0, 1])])
    for (const back of [readText(writeCsv(e), 'r.csv'), readJson(writeJson(e), 'r.json')]) {
      expect(back.configurations.map(c => Array.from(c.points))).toEqual([[1, 0, 0], [0, 1, 0, 0, 0, 1]])
    }
  })

  it('CSV keeps distinct config labels as the config column and NaN/±∞ as words', () => {
    const e = ensembleOf([configurationOf(1, [NaN, Infinity]), configurationOf(1, [-Infinity])], [{ config: 'run-a' }, { config: 'run-b' }])
    const csv = writeCsv(e)
    expect(csv).toBe('config,x\nrun-a,NaN\nrun-a,Infinity\nrun-b,-Infinity\n')
    const back = readText(csv, 'w.csv')
    expect(back.labels).toEqual([{ config: 'run-a' }, { config: 'run-b' }])
    expect(bitsOf(back.configurations[0].points)).toEqual(bitsOf(new Float64Array([NaN, Infinity])))
  })

  it('CSV numbers configurations 0 … M−1 when their config labels are missing or repeated', () => {
    const e = ensembleOf([configurationOf(1, [1]), configurationOf(1, [2])], [{ config: 'same' }, { config: 'same' }])
    expect(writeCsv(e)).toBe('config,x\n0,1\n1,2\n')
  })

  it('the JSON writer refuses NaN and ±∞, naming configuration and point', () => {
    const e = ensembleOf([configurationOf(2, [0, 0]), configurationOf(2, [0, 0, 1, Infinity])])
    const err = failure(() => writeJson(e))
    expect(err.message).toContain('configuration 1, point 1, coordinate 1 is Infinity')
    expect(err.where).toEqual({ configuration: 1, index: 1 })
  })

  it('the CSV writer refuses d > 3', () => {
    expect(failure(() => writeCsv(ensembleOf([configurationOf(4, [1, 2, 3, 4])]))).message).toContain('d = 4')
  })
})

describe('readEnsemble chooses the reader', () => {
  const npy = writeNpy(configurationOf(1, [1]))
  it('by the NPY magic first, then the extension, then the first character', () => {
    expect(detectFormat(npy, 'data.bin')).toBe('npy')
    expect(detectFormat(enc('[[1]]'), 'pts.json')).toBe('json')
    expect(detectFormat(enc('1 2'), 'pts.csv')).toBe('text')
    expect(detectFormat('  \n{"configurations": []}', 'upload')).toBe('json')
    expect(detectFormat('1 2\n', 'upload')).toBe('text')
    expect(readEnsemble(npy, 'data.bin').format).toBe('npy')
    expect(readEnsemble('[[1, 2]]', 'noext').format).toBe('json')
  })

  it('a .npy name without the magic, or NPY given as a string, is a clear error', () => {
    const err = failure(() => readEnsemble(enc('1 2\n'), 'fake.npy'))
    expect(err.message).toContain('does not start with the NPY magic')
    expect(err.where).toMatchObject({ file: 'fake.npy', line: 1, column: 1 })
    expect(failure(() => readEnsemble('x', 'a.txt', { format: 'npy' })).message).toContain('binary')
  })
})
