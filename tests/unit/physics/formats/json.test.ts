import { describe, it, expect } from 'vitest'
import { readJson, formatJsonPath } from '../../../../shared/physics/formats/json'
import { failure, lineColumnOf } from './helpers'

describe('readJson: the three shapes', () => {
  it('[[x, y], …] is one configuration', () => {
    const e = readJson('[[1, 2], [3, 4.5], [-0, 1e-3]]', 'one.json')
    expect(e.format).toBe('json')
    expect(e.d).toBe(2)
    expect(e.configurations).toHaveLength(1)
    expect(Array.from(e.configurations[0].points)).toEqual([1, 2, 3, 4.5, -0, 1e-3])
    expect(Object.is(e.configurations[0].points[4], -0)).toBe(true)
  })

  it('[[[x, y], …], …] is several configurations, with the file line of every point', () => {
    const text = '[\n  [[1, 2], [3, 4]],\n  [\n    [5, 6]\n  ]\n]\n'
    const e = readJson(text, 'many.json')
    expect(e.configurations.map(c => c.N)).toEqual([2, 1])
    expect(Array.from(e.pointLines?.[0] ?? [])).toEqual([2, 2])
    expect(Array.from(e.pointLines?.[1] ?? [])).toEqual([4])
  })

  it('the object form carries labels (strings and numbers, with escapes) and an optional d', () => {
    const text = JSON.stringify({
      d: 1,
      configurations: [
        { labels: { N: 2, beta: 2.5, name: 'Gau\u00dfian "β" \n' }, points: [[0.5], [1.5]] },
        { points: [[2]] },
      ],
    })
    const e = readJson(text, 'obj.json')
    expect(e.d).toBe(1)
    expect(e.labels).toEqual([{ N: 2, beta: 2.5, name: 'Gau\u00dfian "β" \n' }, {}])
    expect(e.configurations.map(c => Array.from(c.points))).toEqual([[0.5, 1.5], [2]])
  })

  it('handles \\u escapes and a byte-order mark in bytes', () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode('{"configurations":[{"labels":{"\\u0041":"\\u00e9\\/"},"points":[[1]]}]}')])
    expect(readJson(bytes, 'u.json').labels).toEqual([{ A: 'é/' }])
  })

  it('a number too large for a double becomes Infinity (the validation reports it with its line)', () => {
    const e = readJson('[[1, 2],\n [1e400, 3]]', 'big.json')
    expect(e.configurations[0].points[2]).toBe(Infinity)
    expect(e.pointLines?.[0]?.[1]).toBe(2)
  })
})

describe('readJson: errors name the JSON path and the line/column', () => {
  it('a string where a coordinate should be: configurations[2].points[17][1]', () => {
    const points = (n: number, bad?: number): string => Array.from({ length: n }, (_, k) => (k === bad ? '      [0.5, "oops"]' : `      [${k}, ${k / 2}]`)).join(',\n')
    const text = `{\n  "configurations": [\n    {"points": [\n${points(3)}]},\n    {"points": [\n${points(2)}]},\n    {"labels": {"N": 18}, "points": [\n${points(18, 17)}]}\n  ]\n}\n`
    const err = failure(() => readJson(text, 'bad.json'))
    expect(err.message).toContain('configurations[2].points[17][1]')
    expect(err.message).toContain('found a string')
    expect(err.where).toMatchObject({ file: 'bad.json', ...lineColumnOf(text, text.indexOf('"oops"')), configuration: 2, index: 17 })
  })

  it('a point with too few or too many coordinates names both points', () => {
    const short = '[[1, 2],\n [3]]'
    const err = failure(() => readJson(short, 's.json'))
    expect(err.message).toContain('the point at [1] has 1 coordinate, expected 2 (as at [0])')
    expect(err.where).toMatchObject(lineColumnOf(short, short.lastIndexOf(']', short.length - 2)))
    const long = '[[[1, 2]], [[3, 4, 5]]]'
    const err2 = failure(() => readJson(long, 'l.json'))
    expect(err2.message).toContain('[1][0] has more than 2 coordinates (the point at [0][0] has 2)')
    expect(err2.where).toMatchObject({ ...lineColumnOf(long, long.indexOf('5')), configuration: 1, index: 0 })
  })

  it('syntax errors on later lines get their line and column', () => {
    const text = '[\n  [1, 2],\n  [3 4]\n]'
    const err = failure(() => readJson(text, 'syn.json'))
    expect(err.message).toContain('expected \',\' or \']\'')
    expect(err.where).toMatchObject(lineColumnOf(text, text.indexOf('4')))
  })

  it('a trailing comma, an unclosed array and text after the value', () => {
    const trailing = '[[1, 2], [3, 4],]'
    expect(failure(() => readJson(trailing, 't.json')).where).toMatchObject(lineColumnOf(trailing, trailing.length - 1))
    expect(failure(() => readJson('[[1, 2], [3, 4]', 'u.json')).message).toContain('the end of the file')
    const extra = '[[1]]\n x'
    expect(failure(() => readJson(extra, 'x.json')).where).toMatchObject({ line: 2, column: 2 })
  })

  it('NaN and Infinity are not JSON', () => {
    const text = '[[1, NaN]]'
    const err = failure(() => readJson(text, 'n.json'))
    expect(err.message).toContain('NaN at [0][1] is not a JSON number')
    expect(err.where).toMatchObject(lineColumnOf(text, 5))
  })

  it('empty arrays, empty configurations and points without coordinates', () => {
    expect(failure(() => readJson('[]', 'e.json')).message).toContain('empty')
    expect(failure(() => readJson('[[]]', 'e.json')).message).toContain('empty array at [0]')
    expect(failure(() => readJson('[[[1]], []]', 'e.json')).message).toContain('the configuration at [1] has no points')
    expect(failure(() => readJson('[[1], []]', 'e.json')).message).toContain('the point at [1] has no coordinates')
    expect(failure(() => readJson('{"configurations": []}', 'e.json')).message).toContain('"configurations" is empty')
  })

  it('unknown and repeated keys, missing points, wrong d', () => {
    const unknown = '{"configurations": [{"points": [[1]], "weights": [1]}]}'
    const err = failure(() => readJson(unknown, 'k.json'))
    expect(err.message).toContain('unknown key "weights" at configurations[0].weights')
    expect(failure(() => readJson('{"d": 1, "extra": 2, "configurations": [{"points": [[1]]}]}', 'k.json')).message).toContain('unknown key "extra" at the top level')
    expect(failure(() => readJson('{"configurations": [{"points": [[1]], "points": [[2]]}]}', 'k.json')).message).toContain('appears twice')
    const missing = '{"configurations": [{"points": [[1]]},\n {"labels": {}}]}'
    const err2 = failure(() => readJson(missing, 'k.json'))
    expect(err2.message).toContain('configurations[1] has no "points"')
    expect(err2.where).toMatchObject({ line: 2, column: 2 })
    const wrongD = '{"d": 3, "configurations": [{"points": [[1, 2]]}]}'
    const err3 = failure(() => readJson(wrongD, 'k.json'))
    expect(err3.message).toContain('"d" is 3 but the points have 2 coordinates')
    expect(err3.where).toMatchObject(lineColumnOf(wrongD, wrongD.indexOf('3')))
  })

  it('labels must be strings or numbers', () => {
    const text = '{"configurations": [{"labels": {"seed": 1, "meta": {"a": 1}}, "points": [[1]]}]}'
    const err = failure(() => readJson(text, 'lab.json'))
    expect(err.message).toContain('configurations[0].labels.meta must be a string or a number, found an object')
    expect(err.where).toMatchObject(lineColumnOf(text, text.indexOf('{"a"')))
  })

  it('a top level that is neither an array nor an object', () => {
    expect(failure(() => readJson('  "points"', 'top.json')).where).toMatchObject({ line: 1, column: 3 })
  })

  it('formats paths with brackets for keys that are not identifiers', () => {
    expect(formatJsonPath(['configurations', 2, 'points', 17, 1])).toBe('configurations[2].points[17][1]')
    expect(formatJsonPath(['configurations', 0, 'labels', 'β N'])).toBe('configurations[0].labels["β N"]')
  })
})
