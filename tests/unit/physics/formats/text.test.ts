import { describe, it, expect } from 'vitest'
import { readText } from '../../../../shared/physics/formats/text'
import { failure } from './helpers'

const enc = (s: string): Uint8Array => new TextEncoder().encode(s)

describe('readText: layouts', () => {
  it('reads whitespace-separated columns without a header, skipping comments and splitting blocks at blank lines', () => {
    const text = '# two configurations\n1 2\n  3\t4  \n\n\n# second\n5 6\n-7.5e-1 +8\n'
    const e = readText(text, 'pts.txt')
    expect(e.format).toBe('text')
    expect(e.d).toBe(2)
    expect(e.configurations.map(c => c.N)).toEqual([2, 2])
    expect(Array.from(e.configurations[0].points)).toEqual([1, 2, 3, 4])
    expect(Array.from(e.configurations[1].points)).toEqual([5, 6, -0.75, 8])
    // Lines are those of the file (comments and blank lines counted).
    expect(Array.from(e.pointLines?.[0] ?? [])).toEqual([2, 3])
    expect(Array.from(e.pointLines?.[1] ?? [])).toEqual([7, 8])
    expect(e.labels).toEqual([{}, {}])
  })

  it('reads CSV with a header x,y,z and CRLF line endings', () => {
    const e = readText(enc('x,y,z\r\n0.5, 1 ,2\r\n3,4,5\r\n'), 'pts.csv')
    expect(e.d).toBe(3)
    expect(Array.from(e.configurations[0].points)).toEqual([0.5, 1, 2, 3, 4, 5])
    expect(Array.from(e.pointLines?.[0] ?? [])).toEqual([2, 3])
  })

  it('reads TSV with a quoted header and places columns by name (y before x)', () => {
    const e = readText('"y"\t"x"\n1\t2\n3\t4\n', 'pts.tsv')
    expect(e.d).toBe(2)
    expect(Array.from(e.configurations[0].points)).toEqual([2, 1, 4, 3])
  })

  it('groups rows by a config column, keeping first-appearance order and warning about interleaved rows', () => {
    const text = 'config,x\n7,0.1\nb,0.2\n7,0.3\nb,0.4\n'
    const e = readText(text, 'g.csv')
    expect(e.configurations.map(c => Array.from(c.points))).toEqual([[0.1, 0.3], [0.2, 0.4]])
    expect(e.labels).toEqual([{ config: 7 }, { config: 'b' }])
    expect(Array.from(e.pointLines?.[0] ?? [])).toEqual([2, 4])
    expect(e.warnings).toHaveLength(2)
    expect(e.warnings[0]).toContain('line 4')
  })

  it('accepts "configuration" as the name of the grouping column and ignores blank lines then', () => {
    const e = readText('x y configuration\n1 2 A\n\n3 4 A\n5 6 B\n', 'g.txt')
    expect(e.configurations.map(c => c.N)).toEqual([2, 1])
    expect(e.labels).toEqual([{ config: 'A' }, { config: 'B' }])
    expect(e.warnings).toEqual([])
  })

  it('reads inf, infinity and nan tokens as ±Infinity and NaN, to be reported by the validation', () => {
    const e = readText('inf -Infinity\nNaN +INF\n', 'p.txt')
    const p = e.configurations[0].points
    expect(p[0]).toBe(Infinity)
    expect(p[1]).toBe(-Infinity)
    expect(Number.isNaN(p[2])).toBe(true)
    expect(p[3]).toBe(Infinity)
  })

  it('drops a UTF-8 byte-order mark and keeps "-0" as negative zero', () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...enc('x\n-0\n')])
    const e = readText(bytes, 'bom.csv')
    expect(Object.is(e.configurations[0].points[0], -0)).toBe(true)
  })

  it('reads files whose lines end in a lone carriage return', () => {
    const e = readText('x y\r1 2\r3 4\r', 'mac.txt')
    expect(Array.from(e.configurations[0].points)).toEqual([1, 2, 3, 4])
    expect(Array.from(e.pointLines?.[0] ?? [])).toEqual([2, 3])
  })

  it('reads 10^5 rows exactly', () => {
    const rows: string[] = ['x,y']
    const expected: number[] = []
    for (let i = 0; i < 100_000; i++) {
      const x = i / 7
      const y = -(i + 1) * 1e-3
      rows.push(`${x},${y}`)
      expected.push(x, y)
    }
    const e = readText(rows.join('\n'), 'big.csv')
    expect(e.configurations[0].N).toBe(100_000)
    const p = e.configurations[0].points
    let mismatches = 0
    for (let k = 0; k < expected.length; k++) if (!Object.is(p[k], expected[k])) mismatches++
    expect(mismatches).toBe(0)
    expect(e.pointLines?.[0]?.[99_999]).toBe(100_001)
  })
})

describe('readText: errors name the line and column', () => {
  it('ragged row: expected versus found column count', () => {
    const err = failure(() => readText('# c\n1 2\n3 4 5\n', 'r.txt'))
    expect(err.message).toContain('found 3 columns, expected 2')
    expect(err.message).toContain('line 2')
    expect(err.where).toMatchObject({ file: 'r.txt', line: 3, column: 5 })
  })

  it('ragged row with too few columns, after a header', () => {
    const err = failure(() => readText('x,y,z\n1,2,3\n4,5\n', 'r.csv'))
    expect(err.message).toContain('found 2 columns, expected 3 (as in the header on line 1')
    expect(err.where).toMatchObject({ line: 3 })
  })

  it('unknown header column names the column', () => {
    const err = failure(() => readText('x,y,beta\n1,2,3\n', 'u.csv'))
    expect(err.message).toContain('unknown column "beta"')
    expect(err.where).toMatchObject({ file: 'u.csv', line: 1, column: 5 })
  })

  it('duplicate header column and a missing y', () => {
    expect(failure(() => readText('x,x\n1,2\n', 'd.csv')).message).toContain('appears twice')
    const err = failure(() => readText('x z\n1 2\n', 'd.txt'))
    expect(err.message).toContain('no y')
    expect(err.where.line).toBe(1)
  })

  it('a field that is not a number', () => {
    const err = failure(() => readText('1,2\n3,abc\n', 'n.csv'))
    expect(err.message).toContain('"abc" is not a number')
    expect(err.where).toMatchObject({ line: 2, column: 3 })
  })

  it('a first line mixing names and numbers is data, with a hint about headers', () => {
    const err = failure(() => readText('x,1\n2,3\n', 'm.csv'))
    expect(err.message).toContain('a header line must name every column')
    expect(err.where).toMatchObject({ line: 1, column: 1 })
  })

  it('an empty CSV field', () => {
    const err = failure(() => readText('1,2,3\n4,,6\n', 'e.csv'))
    expect(err.message).toContain('column 2 is empty')
    expect(err.where).toMatchObject({ line: 2, column: 3 })
  })

  it('numbers in other syntaxes (hex, underscores, decimal comma) are refused', () => {
    expect(failure(() => readText('0x10 1\n', 'h.txt')).where).toMatchObject({ line: 1, column: 1 })
    expect(failure(() => readText('1 1_000\n', 'h.txt')).where).toMatchObject({ line: 1, column: 3 })
    const err = failure(() => readText('1,5;2,5\n', 's.csv'))
    expect(err.message).toContain('"5;2" is not a number')
    expect(err.where).toMatchObject({ line: 1, column: 3 })
  })

  it('semicolon-separated files get advice', () => {
    const err = failure(() => readText('1;2\n', 's.txt'))
    expect(err.message).toContain('semicolon')
    expect(err.where).toMatchObject({ line: 1, column: 2 })
  })

  it('a file with no points', () => {
    expect(failure(() => readText('# only\n\nx,y\n', 'none.csv')).message).toContain('no points')
  })

  it('invalid UTF-8 and UTF-16 files', () => {
    const bad = new Uint8Array([...enc('1 2\n3 '), 0xff, ...enc(' 4\n')])
    const err = failure(() => readText(bad, 'bin.txt'))
    expect(err.message).toContain('not valid UTF-8')
    expect(err.where).toMatchObject({ line: 2, column: 3 })
    expect(failure(() => readText(new Uint8Array([0xff, 0xfe, 0x31, 0]), 'w.txt')).message).toContain('UTF-16')
  })
})
