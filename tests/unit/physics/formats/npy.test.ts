import { describe, it, expect } from 'vitest'
import { readNpy, writeNpy, npyHeaderText, parsePythonLiteral, readNpyHeader } from '../../../../shared/physics/formats/npy'
import { configurationOf, ensembleOf, failure } from './helpers'

// NPY layout (NumPy Enhancement Proposal 1, "A Simple File Format for NumPy Arrays"):
// bytes 0–5 the magic string \x93NUMPY, byte 6 the major and byte 7 the minor version, then the
// header length as a little-endian uint16 (version 1.0) or uint32 (2.0, 3.0), then the header:
// a Python dict literal padded with spaces and ended by '\n'.
const MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59]
const ascii = (s: string): number[] => Array.from(s, ch => ch.charCodeAt(0))

// IEEE 754 binary64 little-endian bytes of 1, 2, −2 and 0.5 (common practice: 1.0 = 0x3FF0000000000000).
const F8_ONE = [0, 0, 0, 0, 0, 0, 0xf0, 0x3f]
const F8_TWO = [0, 0, 0, 0, 0, 0, 0x00, 0x40]
const F8_MINUS_TWO = [0, 0, 0, 0, 0, 0, 0x00, 0xc0]
const F8_HALF = [0, 0, 0, 0, 0, 0, 0xe0, 0x3f]
// binary32 little-endian: 1.0 = 0x3F800000, 2.0 = 0x40000000, −2.0 = 0xC0000000, 0.5 = 0x3F000000 (common practice).
const F4_ONE = [0, 0, 0x80, 0x3f]
const F4_TWO = [0, 0, 0x00, 0x40]
const F4_MINUS_TWO = [0, 0, 0x00, 0xc0]
const F4_HALF = [0, 0, 0x00, 0x3f]
const be = (bytes: number[]): number[] => [...bytes].reverse()

/** An NPY file assembled by hand from the spec: preamble, dict padded to `align`, data. */
function npyFile(major: number, dict: string, data: number[], align = 64): Uint8Array {
  const lengthBytes = major === 1 ? 2 : 4
  const preamble = 8 + lengthBytes
  const pad = (align - ((preamble + dict.length + 1) % align)) % align
  const header = dict + ' '.repeat(pad) + '\n'
  const length = major === 1 ? [header.length & 0xff, header.length >> 8] : [header.length & 0xff, (header.length >> 8) & 0xff, 0, 0]
  return new Uint8Array([...MAGIC, major, 0, ...length, ...ascii(header), ...data])
}

const DICT_2x2 = '{\'descr\': \'<f8\', \'fortran_order\': False, \'shape\': (2, 2), }'

describe('writeNpy against the NPY 1.0 layout', () => {
  it('writes exactly the bytes constructed by hand for the 2×2 array [[1, 2], [−2, 0.5]]', () => {
    // The dict is 59 characters; 10 preamble bytes + 59 + 58 spaces + '\n' = 128, a multiple of 64,
    // so the header length is 59 + 58 + 1 = 118 = 0x76.
    const expected = new Uint8Array([
      ...MAGIC, 0x01, 0x00, 0x76, 0x00,
      ...ascii(DICT_2x2), ...ascii(' '.repeat(58)), 0x0a,
      ...F8_ONE, ...F8_TWO, ...F8_MINUS_TWO, ...F8_HALF,
    ])
    expect(expected.length).toBe(128 + 32)
    const written = writeNpy(configurationOf(2, [1, 2, -2, 0.5]))
    expect(Array.from(written)).toEqual(Array.from(expected))
    const back = readNpy(expected, 'hand.npy')
    expect(back.d).toBe(2)
    expect(Array.from(back.configurations[0].points)).toEqual([1, 2, -2, 0.5])
    expect(back.warnings).toEqual([])
  })

  it('keeps the data start a multiple of 64 with a little-endian uint16 length and a space-padded, newline-ended header', () => {
    for (const [M, N, d] of [[1, 1, 1], [1, 7, 2], [1, 1000000, 3], [3, 5, 3], [12, 123456, 2]]) {
      const configs = Array.from({ length: M }, () => ({ N, d, points: new Float64Array(N * d) }))
      const bytes = writeNpy(M === 1 ? configs[0] : ensembleOf(configs))
      expect(Array.from(bytes.subarray(0, 8))).toEqual([...MAGIC, 1, 0])
      const length = bytes[8] + 256 * bytes[9]
      expect((10 + length) % 64).toBe(0)
      expect(bytes.length).toBe(10 + length + 8 * M * N * d)
      const header = String.fromCharCode(...bytes.subarray(10, 10 + length))
      expect(header.endsWith('\n')).toBe(true)
      const shape = M === 1 ? `(${N}, ${d})` : `(${M}, ${N}, ${d})`
      const dict = `{'descr': '<f8', 'fortran_order': False, 'shape': ${shape}, }`
      expect(header).toBe(dict + ' '.repeat(length - dict.length - 1) + '\n')
    }
  })

  it('npyHeaderText formats a 1-tuple with its comma', () => {
    expect(npyHeaderText([5]).startsWith('{\'descr\': \'<f8\', \'fortran_order\': False, \'shape\': (5,), }')).toBe(true)
  })

  it('refuses an ensemble whose configurations differ in N, suggesting JSON or CSV', () => {
    const err = failure(() => writeNpy(ensembleOf([configurationOf(2, [1, 2]), configurationOf(2, [1, 2, 3, 4])])))
    expect(err.message).toContain('configuration 1 has N = 2 points but configuration 0 has N = 1')
    expect(err.message).toContain('JSON or CSV')
    expect(err.where.configuration).toBe(1)
  })
})

describe('readNpy: versions, dtypes, shapes', () => {
  const data4 = [...F8_ONE, ...F8_TWO, ...F8_MINUS_TWO, ...F8_HALF]

  it('accepts a version 1.0 header aligned to 16 bytes (the 1.0 text) as well as 64', () => {
    const bytes = npyFile(1, DICT_2x2, data4, 16)
    expect(bytes[8]).toBe(70) // 10 + 59 + 10 spaces + '\n' = 80 = 5·16
    const e = readNpy(bytes, 'a16.npy')
    expect(Array.from(e.configurations[0].points)).toEqual([1, 2, -2, 0.5])
    expect(e.warnings).toEqual([])
  })

  it('reads versions 2.0 and 3.0 (uint32 header length; UTF-8 header in 3.0)', () => {
    for (const major of [2, 3]) {
      const bytes = npyFile(major, DICT_2x2, data4)
      expect(bytes[8] + 256 * bytes[9]).toBe(128 - 12) // 12-byte preamble
      expect(Array.from(readNpy(bytes, 'v.npy').configurations[0].points)).toEqual([1, 2, -2, 0.5])
    }
  })

  it('reads big-endian float64 by swapping bytes', () => {
    const dict = '{\'descr\': \'>f8\', \'fortran_order\': False, \'shape\': (2, 2), }'
    const bytes = npyFile(1, dict, [...be(F8_ONE), ...be(F8_TWO), ...be(F8_MINUS_TWO), ...be(F8_HALF)])
    expect(Array.from(readNpy(bytes, 'be.npy').configurations[0].points)).toEqual([1, 2, -2, 0.5])
  })

  it('reads float32, little- and big-endian, with a warning about the precision', () => {
    const le = npyFile(1, '{\'descr\': \'<f4\', \'fortran_order\': False, \'shape\': (2, 2), }', [...F4_ONE, ...F4_TWO, ...F4_MINUS_TWO, ...F4_HALF])
    const e = readNpy(le, 'f4.npy')
    expect(Array.from(e.configurations[0].points)).toEqual([1, 2, -2, 0.5])
    expect(e.warnings.join(' ')).toContain('float32')
    const big = npyFile(1, '{\'descr\': \'>f4\', \'fortran_order\': False, \'shape\': (4, 1), }', [...be(F4_ONE), ...be(F4_TWO), ...be(F4_MINUS_TWO), ...be(F4_HALF)])
    const e2 = readNpy(big, 'f4be.npy')
    expect(e2.d).toBe(1)
    expect(Array.from(e2.configurations[0].points)).toEqual([1, 2, -2, 0.5])
  })

  it('reads a float32 value that is not a short decimal exactly (0.1f = 0x3DCCCCCD)', () => {
    // 0x3DCCCCCD is the binary32 nearest 0.1 (IEEE 754, common practice); its exact value is Math.fround(0.1).
    const bytes = npyFile(1, '{\'descr\': \'<f4\', \'fortran_order\': False, \'shape\': (1, 1), }', [0xcd, 0xcc, 0xcc, 0x3d])
    expect(readNpy(bytes, 'f.npy').configurations[0].points[0]).toBe(Math.fround(0.1))
  })

  it('shape (M, N, d) gives M configurations; keys may come in any order and with double quotes', () => {
    const dict = '{"shape": (2, 3, 1), "fortran_order": False, "descr": "<f8"}'
    const values = [F8_ONE, F8_TWO, F8_MINUS_TWO, F8_HALF, F8_ONE, F8_TWO].flat()
    const e = readNpy(npyFile(1, dict, values), 'm.npy')
    expect(e.d).toBe(1)
    expect(e.configurations.map(c => Array.from(c.points))).toEqual([[1, 2, -2], [0.5, 1, 2]])
    expect(e.labels).toEqual([{}, {}])
  })

  it('reads from a Uint8Array that is a view at an odd offset of a larger buffer', () => {
    const file = npyFile(1, DICT_2x2, data4)
    const big = new Uint8Array(file.length + 3)
    big.set(file, 3)
    expect(Array.from(readNpy(big.subarray(3), 'view.npy').configurations[0].points)).toEqual([1, 2, -2, 0.5])
  })
})

describe('readNpy: clear errors', () => {
  const data4 = [...F8_ONE, ...F8_TWO, ...F8_MINUS_TWO, ...F8_HALF]

  it('Fortran order', () => {
    const err = failure(() => readNpy(npyFile(1, '{\'descr\': \'<f8\', \'fortran_order\': True, \'shape\': (2, 2), }', data4), 'f.npy'))
    expect(err.message).toContain('Fortran')
    expect(err.where.file).toBe('f.npy')
  })

  it('unsupported dtypes and structured dtypes', () => {
    expect(failure(() => readNpy(npyFile(1, '{\'descr\': \'<i8\', \'fortran_order\': False, \'shape\': (2, 2), }', data4), 'i.npy')).message).toContain('dtype \'<i8\' is not read')
    expect(failure(() => readNpy(npyFile(1, '{\'descr\': [(\'x\', \'<f8\')], \'fortran_order\': False, \'shape\': (4,), }', data4), 's.npy')).message).toContain('structured')
  })

  it('shapes other than (N, d) and (M, N, d), and empty arrays', () => {
    expect(failure(() => readNpy(npyFile(1, '{\'descr\': \'<f8\', \'fortran_order\': False, \'shape\': (4,), }', data4), 'v.npy')).message).toContain('shape (4,)')
    expect(failure(() => readNpy(npyFile(1, '{\'descr\': \'<f8\', \'fortran_order\': False, \'shape\': (0, 2), }', []), 'z.npy')).message).toContain('no points')
  })

  it('truncated data, bad magic, unknown version', () => {
    const err = failure(() => readNpy(npyFile(1, DICT_2x2, data4.slice(0, 24)), 't.npy'))
    expect(err.message).toContain('needs 32 bytes, the file has 24')
    expect(failure(() => readNpy(new Uint8Array([1, 2, 3]), 'm.npy')).message).toContain('magic')
    const v4 = npyFile(1, DICT_2x2, data4)
    v4[6] = 4
    expect(failure(() => readNpy(v4, 'v.npy')).message).toContain('version 4.0')
  })

  it('a header that is not a plain literal is refused, never evaluated', () => {
    const evil = '{\'descr\': __import__(\'os\').system(\'rm\'), \'fortran_order\': False, \'shape\': (2, 2), }'
    const err = failure(() => readNpy(npyFile(1, evil, data4), 'evil.npy'))
    expect(err.message).toContain('NPY header, character 11')
    expect(failure(() => readNpy(npyFile(1, '{\'descr\': \'<f8\', \'fortran_order\': False}', data4), 'k.npy')).message).toContain('no \'shape\' key')
  })

  it('extra bytes after the data and a misaligned header give warnings', () => {
    const bytes = npyFile(1, DICT_2x2, [...data4, 0, 0], 1)
    const warnings: string[] = []
    readNpyHeader(bytes, 'w.npy', warnings)
    expect(warnings.join(' ')).toContain('not a multiple of 16 or 64')
    expect(readNpy(bytes, 'w.npy').warnings.join(' ')).toContain('2 bytes after the NPY array data were ignored')
  })

  it('parses Python literals: nested tuples, True/False/None, trailing commas', () => {
    const v = parsePythonLiteral('{\'a\': (1, (2,), []), \'b\': None, \'c\': True, }')
    expect(v).toEqual(new Map<string, unknown>([['a', [1, [2], []]], ['b', null], ['c', true]]))
  })
})
