// The stats and logz commands of the command line, on in-memory files.
import { describe, it, expect } from 'vitest'
import { command as stats } from '../../../../cli/commands/stats'
import { command as logz } from '../../../../cli/commands/logz'
import type { EngineIO } from '../../../../cli/command'
import { gaussianLogZ, ginibreLogZ } from '../../../../shared/physics/partition/exact'
import { betaHermite, createTestRng, poissonBox, toCanonicalLine } from '../../../support/stat-samples'

function memoryIO(files: Record<string, string>): EngineIO {
  return {
    readFile: (path) => {
      const text = files[path]
      if (text === undefined) throw new Error(`no file ${path}`)
      return new TextEncoder().encode(text)
    },
    writeFile: () => {
      throw new Error('no writes expected')
    },
  }
}

function ensembleJson(configs: Float64Array[], d: number): string {
  return JSON.stringify(configs.map((p) => {
    const rows: number[][] = []
    for (let i = 0; i < p.length / d; i++) rows.push(Array.from(p.subarray(i * d, i * d + d)))
    return rows
  }))
}

describe('stats command', () => {
  const rng = createTestRng(81)
  const line = ensembleJson(Array.from({ length: 6 }, () => toCanonicalLine(betaHermite(60, 2, rng), 2, 1)), 1)
  const box = ensembleJson(Array.from({ length: 5 }, () => poissonBox(3, 6, 2, rng)), 2)
  const io = memoryIO({ 'line.json': line, 'box.json': box })

  it('spacing: a table with the surmise, the parameters, the input checksum and the engine version', async () => {
    const out = await stats.run({ input: 'line.json', statistic: 'spacing', preset: 'quadratic', a: 1, beta: 2, bins: 8, seed: '3' }, io) as Record<string, unknown>
    expect(out.statistic).toBe('spacing')
    expect((out.rows as unknown[]).length).toBe(8)
    expect((out.rows as Array<Record<string, number>>)[3].surmise).toBeGreaterThan(0)
    expect(out.inputSha256).toMatch(/^[0-9a-f]{64}$/)
    expect(out.engineVersion).toMatch(/\d/)
    // same seed, same error bars
    const again = await stats.run({ input: 'line.json', statistic: 'spacing', preset: 'quadratic', a: 1, beta: 2, bins: 8, seed: '3' }, io) as Record<string, unknown>
    expect(again.rows).toEqual(out.rows)
  })

  it('torus statistics: g(r), S(k), ψ₆ and Voronoi areas summing to the box', async () => {
    const torus = { input: 'box.json', geometry: 'torus', box: 6 }
    const g = await stats.run({ ...torus, statistic: 'pair-correlation', bins: 5 }, io) as { rows: Array<{ g: number }> }
    expect(g.rows.length).toBe(5)
    const s = await stats.run({ ...torus, statistic: 'structure-factor', nmax: 4 }, io) as { rows: unknown[] }
    expect(s.rows.length).toBeGreaterThan(0)
    const psi = await stats.run({ ...torus, statistic: 'psi6' }, io) as { summary: { leftOut: number } }
    expect(psi.summary.leftOut).toBe(0)
    const v = await stats.run({ ...torus, statistic: 'voronoi' }, io) as { summary: { meanArea: number, dropped: number }, configurations: number }
    expect(v.summary.dropped).toBe(0)
    const counts = JSON.parse(box).map((c: unknown[]) => c.length) as number[]
    expect(v.summary.meanArea).toBeCloseTo((36 * counts.length) / counts.reduce((a, b) => a + b, 0), 9)
  })

  it('linear: f as an expression, the mean ∫ f dμ from the semicircle and Johansson\'s limit', async () => {
    const out = await stats.run({ input: 'line.json', statistic: 'linear', f: 'x^2', preset: 'quadratic', a: 1, beta: 2 }, io) as { summary: Record<string, number> }
    expect(out.summary.integral).toBeCloseTo(0.5, 10)
    expect(out.summary.limitingVariance).toBeCloseTo(0.5, 10)
  })

  it('says what is missing', async () => {
    await expect(stats.run({ input: 'line.json', statistic: 'spacing' }, io)).rejects.toThrow(/--potential or --preset/)
    await expect(stats.run({ input: 'line.json', statistic: 'nothing' }, io)).rejects.toThrow(/--statistic must be one of/)
    await expect(stats.run({ input: 'box.json', statistic: 'number-variance', geometry: 'torus', box: 6 }, io)).rejects.toThrow(/--radii/)
  })
})

describe('logz command', () => {
  it('gaussian and ginibre in the canonical convention, with the expansion beside the exact value', async () => {
    const g = await logz.run({ ensemble: 'gaussian', n: 50, beta: 1, a: 2 }, memoryIO({})) as { logZ: number, expansion: { difference: number } }
    expect(g.logZ).toBeCloseTo(gaussianLogZ(50, 1, 2), 12)
    expect(Math.abs(g.expansion.difference)).toBeLessThan(1)
    const p = await logz.run({ ensemble: 'ginibre', n: 10 }, memoryIO({})) as { logZ: number }
    expect(p.logZ).toBeCloseTo(ginibreLogZ(10, 1), 12)
  })

  it('a convention record changes the meaning of β', async () => {
    const out = await logz.run({ ensemble: 'gaussian', n: 8, beta: 1, convention: '{"pairs":"half","fieldScale":"N/2","logSign":"minus-log","gibbs":"beta"}' }, memoryIO({})) as { logZ: number, canonical: { beta: number } }
    expect(out.canonical.beta).toBeCloseTo(1, 14)
    const half = await logz.run({ ensemble: 'gaussian', n: 8, beta: 1, convention: '{"pairs":"full","fieldScale":"N","logSign":"minus-log","gibbs":"beta"}' }, memoryIO({})) as { logZ: number, canonical: { beta: number } }
    // e^{−βH} with the canonical H is the canonical weight at 2β
    expect(half.canonical.beta).toBeCloseTo(2, 14)
    expect(half.logZ).toBeCloseTo(gaussianLogZ(8, 2, 1), 12)
  })

  it('refuses a bad ensemble and a missing N', async () => {
    await expect(logz.run({ ensemble: 'laguerre', n: 3 }, memoryIO({}))).rejects.toThrow(/gaussian or ginibre/)
    await expect(logz.run({ ensemble: 'gaussian' }, memoryIO({}))).rejects.toThrow(/--n/)
  })
})
