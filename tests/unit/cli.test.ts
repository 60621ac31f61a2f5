// The engine's command line, run in-process with an in-memory file system.
import { describe, expect, it } from 'vitest'
import { runEngine } from '../../cli/engine'
import type { EngineIO } from '../../cli/command'
import { EngineInputError } from '../../shared/physics/errors'

function memoryIO(files: Record<string, string>): EngineIO {
  return {
    readFile(path) {
      const text = files[path]
      if (text === undefined) throw new EngineInputError(`${path}: no such file`, { file: path })
      return new TextEncoder().encode(text)
    },
    writeFile() {},
  }
}

async function json(argv: string[], files: Record<string, string>) {
  const result = await runEngine(argv, memoryIO(files))
  expect(result.stderr).toBe('')
  expect(result.code).toBe(0)
  return JSON.parse(result.stdout)
}

describe('engine command line', () => {
  it('lists its commands and documents their options', async () => {
    const help = await runEngine(['--help'], memoryIO({}))
    expect(help.code).toBe(0)
    for (const name of ['energy', 'next-order', 'equilibrium', 'convert']) expect(help.stdout).toContain(name)
    const one = await runEngine(['energy', '--help'], memoryIO({}))
    expect(one.stdout).toContain('--input <string>')
    expect(one.stdout).toContain('--potential <string>')
  })

  it('computes the energy of two points by hand', async () => {
    // x = ±1 on the line, V = x²: Σ_{i<j} −log|x_i − x_j| = −log 2, Σ V = 2,
    // canonical H = 2·(−log 2) + N·Σ V = −2 log 2 + 4 (the convention of this engine).
    const out = await json(['energy', '--input', 'two.csv', '--potential', 'x^2'], { 'two.csv': 'x\n-1\n1\n' })
    expect(out.N).toBe(2)
    expect(out.d).toBe(1)
    expect(out.pairSum).toBeCloseTo(-Math.log(2), 14)
    expect(out.confinement).toBeCloseTo(2, 14)
    expect(out.H).toBeCloseTo(-2 * Math.log(2) + 4, 13)
    expect(out.engineVersion).toMatch(/^\d+\.\d+\.\d+$/)
    expect(out.inputSha256).toMatch(/^[0-9a-f]{64}$/)
    expect(out.convention.canonical).toContain('Σ_{i≠j}')
  })

  it('converts into the convention asked for', async () => {
    // ½Σ_{i≠j} with V unscaled: H = −log 2 + 2 for the two points above.
    const out = await json(['energy', '--input', 'two.csv', '--potential', 'x^2', '--convention', '{"pairs":"half","fieldScale":1,"logSign":"minus-log","gibbs":"beta"}'], { 'two.csv': 'x\n-1\n1\n' })
    expect(out.Hconv).toBeCloseTo(-Math.log(2) + 2, 13)
  })

  it('gives the closed-form equilibrium measure of the quadratic potential', async () => {
    // Semicircle on [−√2, √2] for V = x² (Saff & Totik 1997, ch. IV): I_V = ½ log 2 + ¾.
    const out = await json(['equilibrium', '--dim', '1', '--potential', 'x^2'], {})
    expect(out.method).toBe('closed-form')
    expect(out.supportRadius).toBeCloseTo(Math.SQRT2, 14)
    expect(out.IV).toBeCloseTo(0.5 * Math.log(2) + 0.75, 13)
  })

  it('reports F_N with a splitting residual at rounding level', async () => {
    const rows = ['x,y', '0.1,0.2', '-0.5,0.3', '0.4,-0.6', '-0.2,-0.1', '0.7,0.5']
    const out = await json(['next-order', '--input', 'five.csv', '--preset', 'quadratic', '--eta', 'fixed:0.01'], { 'five.csv': rows.join('\n') })
    expect(out.N).toBe(5)
    expect(out.IV).toBeCloseTo(0.75, 14)
    expect(Math.abs(out.splittingResidual.relative)).toBeLessThan(1e-12)
    // Balls of radius 0.01 around these points are disjoint, so the lower bound is attained (Newton's
    // theorem: Lieb & Loss, Analysis, 2nd ed. 2001, Thm 9.7).
    expect(out.electric[0].overlaps).toBe(0)
    expect(Math.abs(out.electric[0].gap)).toBeLessThan(1e-9)
  })

  it('sums the pairs by the method chosen from N and the tolerance, and names it with its bound in each row', async () => {
    // N-th roots of unity: Σ_{i<j} −log|ω^i − ω^j| = −(N/2) log N (|Π_{j≠i}(ω^i − ω^j)| = N, the
    // derivative of z^N − 1 at a root; elementary closed form)
    const roots = (N: number) => ['x,y', ...Array.from({ length: N }, (_, k) => `${Math.cos((2 * Math.PI * k) / N)},${Math.sin((2 * Math.PI * k) / N)}`)].join('\n')
    const small = await json(['energy', '--input', 'small.csv'], { 'small.csv': roots(64) })
    expect(small.method).toBe('direct-native')
    expect(small.errorBound).toBe(0)
    expect(Math.abs(small.pairSum + 32 * Math.log(64))).toBeLessThanOrEqual(1e-13 * 32 * Math.log(64))
    const N = 60000
    const large = await json(['energy', '--input', 'large.csv', '--tolerance', '1e-8'], { 'large.csv': roots(N) })
    const exact = -(N / 2) * Math.log(N)
    expect(large.method).toBe('fmm2d')
    expect(large.errorBound).toBeGreaterThan(0)
    expect(large.errorBound).toBeLessThanOrEqual(1e-8)
    expect(Math.abs(large.pairSum - exact) / Math.abs(exact)).toBeLessThanOrEqual(1e-8)
    const next = await json(['next-order', '--input', 'large.csv', '--tolerance', '1e-8', '--preset', 'quadratic', '--eta', 'fixed:1e-5'], { 'large.csv': roots(N) })
    expect(next.method).toBe('fmm2d')
    expect(next.errorBound).toBeLessThanOrEqual(1e-8)
    expect(Math.abs(next.pairSum - exact) / Math.abs(exact)).toBeLessThanOrEqual(1e-8)
    for (const command of ['energy', 'next-order']) {
      const bad = await runEngine([command, '--input', 'small.csv', '--tolerance', '2'], memoryIO({ 'small.csv': roots(64) }))
      expect(bad.code).toBe(2)
      expect(bad.stderr).toContain('--tolerance must be in (0, 1)')
    }
  })

  it('names the two coincident points and exits with 1', async () => {
    const result = await runEngine(['energy', '--input', 'dup.csv', '--potential', 'r^2'], memoryIO({ 'dup.csv': 'x,y\n0,0\n1,1\n0,0\n' }))
    expect(result.code).toBe(1)
    expect(result.stderr).toContain('dup.csv, line 4')
    expect(result.stderr).toContain('points 0 and 2 coincide')
    expect(result.stderr).toContain('"indices":[0,2]')
  })

  it('says what is wrong with the command line and exits with 2', async () => {
    const unknown = await runEngine(['energy', '--inptu', 'x.csv'], memoryIO({}))
    expect(unknown.code).toBe(2)
    expect(unknown.stderr).toContain('unknown option --inptu')
    const missing = await runEngine(['energy'], memoryIO({}))
    expect(missing.code).toBe(2)
    expect(missing.stderr).toContain('--input is required')
    const nofile = await runEngine(['energy', '--input', 'nope.csv'], memoryIO({}))
    expect(nofile.code).toBe(1)
    expect(nofile.stderr).toContain('nope.csv: no such file')
  })
})
