import { describe, it, expect } from 'vitest'
import { validateEnsemble, collectProblems, findCoincidentPairs } from '../../../../shared/physics/formats/validate'
import { readText } from '../../../../shared/physics/formats/text'
import { readJson } from '../../../../shared/physics/formats/json'
import { readNpy, writeNpy } from '../../../../shared/physics/formats/npy'
import { inspectEnsembleFile } from '../../../../shared/physics/formats/read'
import type { Geometry } from '../../../../shared/physics/types'
import { configurationOf, ensembleOf, failure } from './helpers'

const plane: Geometry = { kind: 'free', d: 2 }
const sphere: Geometry = { kind: 'sphere' }

/** A seeded linear congruential generator (Knuth, TAOCP vol. 2, §3.2.1; constants of Numerical Recipes). */
function lcg(seed: number): () => number {
  let s = seed >>> 0
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0
    return s / 2 ** 32
  }
}

describe('validateEnsemble', () => {
  it('returns the same ensemble when everything is fine', () => {
    const e = readText('0 0\n1 0\n0 1\n', 'ok.txt')
    expect(validateEnsemble(e, { geometry: plane })).toBe(e)
  })

  it('NaN and ±∞: configuration, point, coordinate and file line', () => {
    const e = readText('# two configurations\n0 0\n1 1\n\n2 2\n3 inf\n', 'nan.txt')
    const err = failure(() => validateEnsemble(e, { geometry: plane }))
    expect(err.message).toBe('nan.txt, line 6: configuration 1, point 1: y (coordinate 1) is Infinity')
    expect(err.where).toMatchObject({ file: 'nan.txt', line: 6, configuration: 1, index: 1 })
    const e2 = readText('nan 0\n', 'n.txt')
    expect(failure(() => validateEnsemble(e2, { geometry: plane })).message).toContain('x (coordinate 0) is NaN')
  })

  it('an overflowing JSON number is reported with its line', () => {
    const e = readJson('[[0, 0],\n [-1e999, 1]]', 'o.json')
    const err = failure(() => validateEnsemble(e, { geometry: plane }))
    expect(err.message).toContain('point 1: x (coordinate 0) is -Infinity')
    expect(err.where).toMatchObject({ file: 'o.json', line: 2, index: 1, configuration: 0 })
  })

  it('NPY input has no lines but keeps configuration and index', () => {
    const bytes = writeNpy(ensembleOf([configurationOf(2, [0, 0, 1, 1]), configurationOf(2, [0, 0, NaN, 1])]))
    const err = failure(() => validateEnsemble(readNpy(bytes, 'x.npy'), { geometry: plane }))
    expect(err.where).toEqual({ file: 'x.npy', configuration: 1, index: 1 })
  })

  it('wrong dimension for the geometry', () => {
    const e3 = readText('0 0 1\n', 'd3.txt')
    expect(failure(() => validateEnsemble(e3, { geometry: plane })).message).toContain('free space R^2, but the points have 3 coordinates')
    const e2 = readText('0 1\n', 'd2.txt')
    expect(failure(() => validateEnsemble(e2, { geometry: sphere })).message).toContain('exactly 3 coordinates')
    expect(failure(() => validateEnsemble(e2, { geometry: { kind: 'torus', d: 1, L: 2 } })).message).toContain('the torus [0, L)^1')
    const e4 = readText('0 1 2 3\n', 'd4.txt')
    expect(failure(() => validateEnsemble(e4, { geometry: { kind: 'free', d: 3 } })).message).toContain('4 coordinates')
  })

  it('coincident points: the two indices and their lines', () => {
    const e = readText('x,y\n0,0\n1,2\n3,4\n1,2\n', 'c.csv')
    const err = failure(() => validateEnsemble(e, { geometry: plane }))
    expect(err.message).toBe('c.csv, line 5: configuration 0: points 1 and 3 coincide (lines 3 and 5); their pair energy is infinite')
    expect(err.where).toMatchObject({ indices: [1, 3], index: 3, line: 5, configuration: 0 })
  })

  it('finds one planted coincidence among 50 000 random points (sorting, not all pairs)', () => {
    const rand = lcg(12345)
    const N = 50_000
    const p = new Float64Array(3 * N)
    for (let k = 0; k < p.length; k++) p[k] = rand()
    p.set(p.subarray(3 * 123, 3 * 124), 3 * 41_000)
    expect(findCoincidentPairs({ N, d: 3, points: p })).toEqual([[123, 41_000]])
    const e = ensembleOf([{ N, d: 3, points: p }])
    expect(failure(() => validateEnsemble(e, { geometry: { kind: 'free', d: 3 } })).where.indices).toEqual([123, 41_000])
  })

  it('−0 and 0 are the same place; distinct but close points are not coincident', () => {
    expect(findCoincidentPairs(configurationOf(2, [0, 1, -0, 1]))).toEqual([[0, 1]])
    expect(findCoincidentPairs(configurationOf(1, [1, 1 + 2 ** -52, 5e-324, 0]))).toEqual([])
    expect(findCoincidentPairs(configurationOf(1, [2, 7, 2, 2]))).toEqual([[0, 2], [2, 3]])
  })

  it('points off the unit sphere: index and deviation, default tolerance 1e-9', () => {
    const s = Math.SQRT1_2
    const e = ensembleOf([configurationOf(3, [1, 0, 0, 0, s, s, 0, 0, 1 + 2e-9, 0, 0, -1])])
    const err = failure(() => validateEnsemble(e, { geometry: sphere }))
    expect(err.message).toContain('configuration 0, point 2 is off the unit sphere: | |x| − 1 | = 2.00e-9 exceeds the tolerance 1e-9')
    expect(err.where).toMatchObject({ index: 2, configuration: 0 })
    expect(validateEnsemble(e, { geometry: sphere, tolerance: 1e-8 })).toBe(e)
    const tight = ensembleOf([configurationOf(3, [0, 0, 1 + 5e-10])])
    expect(validateEnsemble(tight, { geometry: sphere })).toBe(tight)
  })

  it('points outside the box [0, L): index and coordinate; L itself is outside', () => {
    const torus: Geometry = { kind: 'torus', d: 2, L: 2 }
    const ok = ensembleOf([configurationOf(2, [0, 0, 1.999, 1])])
    expect(validateEnsemble(ok, { geometry: torus })).toBe(ok)
    const atL = readText('0 0\n1 2\n', 'box.txt')
    const err = failure(() => validateEnsemble(atL, { geometry: torus }))
    expect(err.message).toBe('box.txt, line 2: configuration 0, point 1: y (coordinate 1) = 2 is outside the box [0, 2)')
    expect(err.where).toMatchObject({ index: 1, line: 2 })
    const negative = ensembleOf([configurationOf(2, [0.5, 0.5, -5e-324, 1])])
    expect(failure(() => validateEnsemble(negative, { geometry: torus })).message).toContain('x (coordinate 0) = -5e-324 is outside')
  })

  it('an invalid torus side is reported before anything else', () => {
    const e = ensembleOf([configurationOf(1, [0])])
    expect(failure(() => validateEnsemble(e, { geometry: { kind: 'torus', d: 1, L: 0 } })).message).toContain('L must be a finite number > 0')
  })
})

describe('collectProblems', () => {
  it('returns up to K problems in a stable order', () => {
    const text = 'nan 0\n0 0\n3 -1\n0 0\ninf 1\n0 5\n'
    const e = readText(text, 'many.txt')
    const all = collectProblems(e, { geometry: { kind: 'torus', d: 2, L: 4 } })
    expect(all.map(p => p.kind)).toEqual(['non-finite', 'non-finite', 'outside-box', 'outside-box'])
    expect(all.map(p => p.where.line)).toEqual([1, 5, 3, 6])
    expect(collectProblems(e, { geometry: { kind: 'torus', d: 2, L: 4 }, maxProblems: 2 })).toHaveLength(2)
    const finite = readText('0 0\n1 1\n0 0\n1 1\n', 'dup.txt')
    const pairs = collectProblems(finite, { geometry: plane })
    expect(pairs.map(p => p.where.indices)).toEqual([[0, 2], [1, 3]])
  })

  it('inspectEnsembleFile turns a reading error into one located problem', () => {
    const r = inspectEnsembleFile('1 2\n3\n', 'bad.txt', { geometry: plane })
    expect(r.ensemble).toBeUndefined()
    expect(r.problems).toHaveLength(1)
    expect(r.problems[0].kind).toBe('read')
    expect(r.problems[0].where).toMatchObject({ file: 'bad.txt', line: 2 })
    const ok = inspectEnsembleFile('1 2\n1 2\n', 'dup.txt', { geometry: plane })
    expect(ok.ensemble?.configurations[0].N).toBe(2)
    expect(ok.problems.map(p => p.kind)).toEqual(['coincident'])
  })
})
