// Upload parsing: the good fixtures of every format, the corpus of malformed files with their
// expected errors, zip limits, the piscina worker entry, and the summary / preview functions.
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { strToU8, zipSync } from 'fflate'
import { Piscina } from 'piscina'
import { afterAll, describe, expect, it } from 'vitest'
import type { InputLocation } from '../../shared/physics/errors'
import type { Configuration, Geometry } from '../../shared/physics/types'
import { ENGINE_VERSION } from '../../shared/physics/version'
import { configurationChecksum } from '../../shared/physics/formats/hash'
import { pairDistance, previewPoints, summariseConfiguration } from '../../shared/physics/formats/summary'
import { createRng, type Rng } from '../../shared/physics/random'
import { parseUpload, type ParseUploadInput, type ParseUploadResult, type ParseUploadSuccess } from '../../server/workers/parse-ensemble'

const fixtures = fileURLToPath(new URL('../fixtures/', import.meta.url))
const goodDir = join(fixtures, 'good')
const badDir = join(fixtures, 'malformed')
const scratch = mkdtempSync(join(tmpdir(), 'upload-parsing-'))
afterAll(() => rmSync(scratch, { recursive: true, force: true }))

const FREE2: Geometry = { kind: 'free', d: 2 }

// The points written by tests/fixtures/make-fixtures.ts, stated again here so that the test
// checks the files' contents, not only their agreement with each other.
const P = [[0, 0], [1, 0.5], [-0.25, 2], [3.125, -1], [0.1, 0.3]]
const Q = [
  [[0, 0], [1, 0], [0, 1], [1, 1]],
  [[0.5, 0.25], [-1.5, 2], [2.75, -0.125], [0, 3]],
  [[10, 10], [10.5, 10], [10, 10.5], [-4, -8]],
]
const SPHERE_POINTS = [[1, 0, 0], [0, 1, 0], [0, 0, 1], [-1, 0, 0], [0, -1, 0], [0, 0, -1], [0.6, 0.8, 0], [0, 0.6, -0.8]]
const TORUS_POINTS = [[0.05, 0.5], [0.95, 0.5], [0.5, 0.5], [0.5, 0.1], [0.3, 0.8]]

function configuration(rows: number[][]): Configuration {
  return { N: rows.length, d: rows[0].length, points: new Float64Array(rows.flat()) }
}

function success(result: ParseUploadResult): ParseUploadSuccess {
  if (!result.ok) throw new Error(`expected success, got: ${result.error.message}`)
  return result
}

async function parseGood(name: string, geometry: Geometry = FREE2, extra: Partial<ParseUploadInput> = {}): Promise<ParseUploadSuccess> {
  return success(await parseUpload({ path: join(goodDir, name), fileName: name, geometry, ...extra }))
}

/** Smallest pair distance by the direct N(N − 1)/2 search, with pairDistance's metric. */
function bruteMinimum(c: Configuration, period?: number): number {
  let best = Infinity
  for (let i = 0; i < c.N; i++) {
    for (let j = i + 1; j < c.N; j++) best = Math.min(best, pairDistance(c, i, j, { period }))
  }
  return best
}

function randomConfiguration(rng: Rng, N: number, d: number, scale = 1): Configuration {
  const points = new Float64Array(N * d)
  for (let k = 0; k < points.length; k++) points[k] = scale * rng.uniform()
  return { N, d, points }
}

describe('good fixtures', () => {
  const single: Array<[string, string]> = [
    ['points-header.csv', 'text'],
    ['points-noheader.tsv', 'text'],
    ['points-comments.txt', 'text'],
    ['points-array.json', 'json'],
    ['points-f8.npy', 'npy'],
  ]
  it.each(single)('%s holds the five points P with the checksum of P', async (name, format) => {
    const r = await parseGood(name)
    expect(r.format).toBe(format)
    expect(r.d).toBe(2)
    expect(r.configurations.map(s => s.N)).toEqual([5])
    expect(r.configurations[0].checksum).toBe(await configurationChecksum(configuration(P)))
    expect(r.configurations[0].bbox).toEqual({ min: [-0.25, -1], max: [3.125, 2] })
    expect(r.preview).toEqual({ d: 2, points: P })
    expect(r.engineVersion).toBe(ENGINE_VERSION)
  })

  const several: Array<[string, string]> = [
    ['configs-column.csv', 'text'],
    ['configs-nested.json', 'json'],
    ['configs-object.json', 'json'],
    ['configs-f4.npy', 'npy'],
  ]
  it.each(several)('%s holds the three configurations Q with their checksums', async (name, format) => {
    const r = await parseGood(name)
    expect(r.format).toBe(format)
    expect(r.d).toBe(2)
    expect(r.configurations.map(s => s.N)).toEqual([4, 4, 4])
    const expected = await Promise.all(Q.map(c => configurationChecksum(configuration(c))))
    expect(r.configurations.map(s => s.checksum)).toEqual(expected)
    expect(r.preview.points).toEqual(Q[0])
  })

  it('keeps the labels of each format', async () => {
    expect((await parseGood('configs-column.csv')).labels).toEqual([{ config: 'run0' }, { config: 'run1' }, { config: 'run2' }])
    expect((await parseGood('configs-object.json')).labels).toEqual([0, 1, 2].map(seed => ({ N: 4, beta: 2, seed })))
    expect((await parseGood('configs-nested.json')).labels).toEqual([{}, {}, {}])
    const f4 = await parseGood('configs-f4.npy')
    expect(f4.warnings.some(w => w.includes('float32'))).toBe(true)
  })

  it('reads every point entry of a zip, skipping directories, __MACOSX/ and dotfiles', async () => {
    const r = await parseGood('runs.zip')
    expect(r.format).toBe('zip')
    expect(r.d).toBe(2)
    expect(r.labels).toEqual([{ file: 'beta2/q0.csv' }, { file: 'beta2/q1.csv' }])
    const expected = await Promise.all(Q.slice(0, 2).map(c => configurationChecksum(configuration(c))))
    expect(r.configurations.map(s => s.checksum)).toEqual(expected)
  })

  it('reads points on S² for the sphere geometry, with chordal distances', async () => {
    const r = await parseGood('sphere.csv', { kind: 'sphere' })
    expect(r.d).toBe(3)
    expect(r.configurations[0].N).toBe(8)
    expect(r.configurations[0].checksum).toBe(await configurationChecksum(configuration(SPHERE_POINTS)))
    // The closest pairs are (0,1,0)–(0.6,0.8,0) and (0,0,−1)–(0,0.6,−0.8): chord √(0.36 + 0.04) = √0.4.
    expect(r.configurations[0].minDistance).toBeCloseTo(Math.sqrt(0.4), 12)
    expect([[1, 6], [5, 7]]).toContainEqual(r.configurations[0].minPair)
  })

  it('measures minimum-image distances on the torus', async () => {
    const r = await parseGood('torus.csv', { kind: 'torus', d: 2, L: 1 })
    const s = r.configurations[0]
    expect(s.checksum).toBe(await configurationChecksum(configuration(TORUS_POINTS)))
    // Points 0 and 1 are 0.9 apart in the plane but 0.1 apart across the boundary x = 0 ≡ 1.
    expect(s.minPair).toEqual([0, 1])
    expect(s.minDistance).toBeCloseTo(0.1, 12)
    // In free space the closest pair is (0.5, 0.5)–(0.3, 0.8), at √(0.04 + 0.09) = √0.13.
    const free = (await parseGood('torus.csv')).configurations[0]
    expect(free.minPair).toEqual([2, 4])
    expect(free.minDistance).toBeCloseTo(Math.sqrt(0.13), 12)
  })
})

interface Expectation {
  geometry: Geometry
  message: string
  where: InputLocation
  options?: { maxConfigurations?: number }
}

const expectations = JSON.parse(readFileSync(join(badDir, 'expected.json'), 'utf8')) as Record<string, Expectation>

describe('malformed corpus', () => {
  it('has at least 35 files, each with an expectation and each expectation with a file', () => {
    const files = readdirSync(badDir).filter(f => f !== 'expected.json').sort()
    expect(files.length).toBeGreaterThanOrEqual(35)
    expect(Object.keys(expectations).sort()).toEqual(files)
  })

  it.each(Object.entries(expectations))('%s is refused with the expected message and location', async (name, e) => {
    const r = await parseUpload({ path: join(badDir, name), fileName: name, geometry: e.geometry, ...e.options })
    if (r.ok) throw new Error(`${name} was accepted`)
    expect(r.error.message).toContain(e.message)
    for (const [key, value] of Object.entries(e.where)) {
      expect({ [key]: r.error.where[key as keyof InputLocation] }).toEqual({ [key]: value })
    }
    // Every message starts with the name of the file (or archive entry) it concerns.
    expect(r.error.message.startsWith(name)).toBe(true)
  })
})

describe('zip limits', () => {
  it('refuses more than 10 000 entries by default, and the given entry limit', async () => {
    const entries: Record<string, Uint8Array> = {}
    const row = strToU8('0,0\n1,1\n')
    for (let i = 0; i <= 10_000; i++) entries[`e${i}.csv`] = row
    const many = join(scratch, 'many.zip')
    writeFileSync(many, zipSync(entries, { level: 0 }))
    const r = await parseUpload({ path: many, fileName: 'many.zip', geometry: FREE2 })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toContain('has 10001 entries, more than the 10000 allowed')
    const small = await parseUpload({ path: join(goodDir, 'runs.zip'), fileName: 'runs.zip', geometry: FREE2, maxEntries: 5 })
    expect(small.ok).toBe(false)
    if (!small.ok) expect(small.error.message).toContain('has 6 entries, more than the 5 allowed')
  })

  it('refuses entries whose declared sizes pass the byte limit in total', async () => {
    // runs.zip holds q0.csv (20 bytes: header and four rows) and q1.csv (32 bytes): 52 bytes in total.
    const r = await parseUpload({ path: join(goodDir, 'runs.zip'), fileName: 'runs.zip', geometry: FREE2, maxUncompressedBytes: 40 })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.error.message).toMatch(/more than (the )?40/)
    const enough = await parseUpload({ path: join(goodDir, 'runs.zip'), fileName: 'runs.zip', geometry: FREE2, maxUncompressedBytes: 10_000 })
    expect(enough.ok).toBe(true)
  })

  it('throws for I/O faults instead of returning ok: false', async () => {
    await expect(parseUpload({ path: join(scratch, 'missing.csv'), fileName: 'missing.csv', geometry: FREE2 })).rejects.toThrow(/ENOENT/)
  })
})

describe('piscina worker entry', () => {
  it('parses a file through a real Piscina pool', async () => {
    const pool = new Piscina({
      filename: new URL('../../server/workers/parse-ensemble.ts', import.meta.url).href,
      // Node 20 cannot load TypeScript by itself: the worker thread gets tsx's loader.
      execArgv: ['--import', 'tsx'],
      minThreads: 1,
      maxThreads: 1,
    })
    try {
      const input: ParseUploadInput = { path: join(goodDir, 'configs-f4.npy'), fileName: 'configs-f4.npy', geometry: FREE2 }
      const viaPool = await pool.run(input) as ParseUploadResult
      expect(viaPool).toEqual(await parseUpload(input))
      const bad = await pool.run({ path: join(badDir, 'nan.csv'), fileName: 'nan.csv', geometry: FREE2 }) as ParseUploadResult
      expect(bad.ok).toBe(false)
    }
    finally {
      await pool.destroy()
    }
  }, 30_000)
})

describe('summariseConfiguration', () => {
  it('finds the same smallest distance as the direct O(N²) search on random inputs', async () => {
    const rng = createRng('closest-pair')
    for (const d of [1, 2, 3, 5]) {
      for (const N of [2, 3, 17, 400]) {
        const c = randomConfiguration(rng, N, d)
        const s = await summariseConfiguration(c)
        const [i, j] = s.minPair as [number, number]
        expect(i).toBeLessThan(j)
        expect(s.minDistance).toBe(bruteMinimum(c))
        expect(pairDistance(c, i, j)).toBe(s.minDistance)
      }
    }
  })

  it('finds the smallest minimum-image distance on the torus', async () => {
    const rng = createRng('closest-pair-torus')
    for (const d of [1, 2, 3]) {
      for (const N of [2, 9, 300]) {
        const L = 2.5
        const c = randomConfiguration(rng, N, d, L)
        const s = await summariseConfiguration(c, { period: L })
        expect(s.minDistance).toBe(bruteMinimum(c, L))
        expect(s.minDistance as number).toBeLessThanOrEqual(bruteMinimum(c))
      }
    }
  })

  it('handles clustered points, a lattice with ties, and coincident points', async () => {
    const rng = createRng('clusters')
    // Two tight clusters far apart plus a lone point: a uniform cell grid would put all in one cell.
    const rows: number[][] = []
    for (let i = 0; i < 300; i++) rows.push([1e-6 * rng.uniform(), 1e-6 * rng.uniform()])
    for (let i = 0; i < 300; i++) rows.push([1000 + 1e-3 * rng.uniform(), 1e-3 * rng.uniform()])
    rows.push([1e6, -1e6])
    const clustered = configuration(rows)
    expect((await summariseConfiguration(clustered)).minDistance).toBe(bruteMinimum(clustered))
    // The integer lattice {0..19}²: every nearest pair is at distance exactly 1.
    const lattice = configuration(Array.from({ length: 400 }, (_, k) => [k % 20, Math.floor(k / 20)]))
    expect((await summariseConfiguration(lattice)).minDistance).toBe(1)
    const twice = configuration([[0, 0], [1, 2], [3, 3], [1, 2]])
    const s = await summariseConfiguration(twice)
    expect(s.minDistance).toBe(0)
    expect(s.minPair).toEqual([1, 3])
    const allSame = configuration(Array.from({ length: 1000 }, () => [4, 4]))
    expect((await summariseConfiguration(allSame)).minDistance).toBe(0)
  })

  it('reports the bounding box, N, d and checksum, and null distances below two points', async () => {
    const rng = createRng('bbox')
    const c = randomConfiguration(rng, 50, 3, 7)
    const s = await summariseConfiguration(c)
    expect(s.N).toBe(50)
    expect(s.d).toBe(3)
    for (let k = 0; k < 3; k++) {
      const column = Array.from({ length: 50 }, (_, i) => c.points[3 * i + k])
      expect(s.bbox.min[k]).toBe(Math.min(...column))
      expect(s.bbox.max[k]).toBe(Math.max(...column))
    }
    expect(s.checksum).toBe(await configurationChecksum(c))
    const one = await summariseConfiguration(configuration([[1, 2]]))
    expect(one.minDistance).toBeNull()
    expect(one.minPair).toBeNull()
    const none = await summariseConfiguration({ N: 0, d: 2, points: new Float64Array(0) })
    expect(none.bbox).toEqual({ min: [], max: [] })
  })

  it('handles a large configuration (N = 50 000) with a correct closest pair', async () => {
    const rng = createRng('large')
    const c = randomConfiguration(rng, 50_000, 2)
    const s = await summariseConfiguration(c)
    const [i, j] = s.minPair as [number, number]
    expect(pairDistance(c, i, j)).toBe(s.minDistance)
    // Check against a direct search over a band of the x-sorted order wide enough for the found distance.
    const order = Array.from({ length: c.N }, (_, k) => k).sort((a, b) => c.points[2 * a] - c.points[2 * b])
    let best = Infinity
    for (let r = 0; r < order.length; r++) {
      for (let t = r + 1; t < order.length && c.points[2 * order[t]] - c.points[2 * order[r]] <= (s.minDistance as number); t++) {
        best = Math.min(best, pairDistance(c, order[r], order[t]))
      }
    }
    expect(s.minDistance).toBe(best)
  })

  it('rejects a period that is not a positive finite number', async () => {
    await expect(summariseConfiguration(configuration(P), { period: 0 })).rejects.toThrow(RangeError)
  })
})

describe('previewPoints', () => {
  it('takes every k-th point, k = ⌈N / max⌉, deterministically', () => {
    const rng = createRng('preview')
    const c = randomConfiguration(rng, 4999, 2)
    const a = previewPoints(c)
    expect(a).toEqual(previewPoints(c))
    // k = ⌈4999 / 2000⌉ = 3, so points 0, 3, …, 4998: 1667 rows.
    expect(a.length).toBe(1667)
    a.forEach((row, r) => expect(row).toEqual([c.points[6 * r], c.points[6 * r + 1]]))
    expect(previewPoints(c, 100).length).toBeLessThanOrEqual(100)
    expect(previewPoints(configuration(P))).toEqual(P)
    expect(() => previewPoints(c, 0)).toThrow(RangeError)
  })
})
