import { describe, it, expect } from 'vitest'
import {
  doubleWellPotential, parsePotential, presetPotential, quadraticPotential, quarticPotential, radialPowerPotential,
} from '../../../shared/physics/potentials'
import type { Potential } from '../../../shared/physics/potentials'
import { EngineInputError } from '../../../shared/physics/errors'

// Deterministic test points (a small linear congruential generator; common practice).
function points(n: number, d: number, seed: number): Float64Array {
  let s = seed >>> 0
  const out = new Float64Array(n * d)
  for (let i = 0; i < out.length; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0
    out[i] = (s / 2 ** 32) * 3 - 1.5
  }
  return out
}

// Second-order central differences with step h (common practice), independent of the code under test.
function centralGradient(V: Potential, p: Float64Array, offset: number, h = 1e-5): number[] {
  const g: number[] = []
  for (let i = 0; i < V.d; i++) {
    const up = p.slice(offset, offset + V.d)
    const dn = p.slice(offset, offset + V.d)
    up[i] += h
    dn[i] -= h
    g.push((V.value(up) - V.value(dn)) / (2 * h))
  }
  return g
}

function centralLaplacian(V: Potential, p: Float64Array, offset: number, h = 1e-4): number {
  let s = 0
  const x0 = p.slice(offset, offset + V.d)
  const v0 = V.value(x0)
  for (let i = 0; i < V.d; i++) {
    const up = x0.slice()
    const dn = x0.slice()
    up[i] += h
    dn[i] -= h
    s += (V.value(up) - 2 * v0 + V.value(dn)) / (h * h)
  }
  return s
}

const PRESETS: Array<[string, (d: number) => Potential]> = [
  ['quadratic a=1.5', d => quadraticPotential(1.5, d)],
  ['quartic a=0.5 b=2', d => quarticPotential(0.5, 2, d)],
  ['double well a=1.5 b=0.25', d => doubleWellPotential(1.5, 0.25, d)],
  ['radial power a=2 p=3', d => radialPowerPotential(2, 3, d)],
  ['radial power a=1 p=2.5', d => radialPowerPotential(1, 2.5, d)],
]

describe('preset potentials', () => {
  for (const [name, make] of PRESETS) {
    for (const d of [1, 2, 3]) {
      it(`${name}, d = ${d}: gradient and Laplacian agree with central differences`, () => {
        const V = make(d)
        const p = points(20, d, 7 + d)
        const out = new Float64Array(d)
        for (let k = 0; k < 20; k++) {
          V.gradient(p, k * d, out)
          const g = centralGradient(V, p, k * d)
          for (let i = 0; i < d; i++) expect(out[i]).toBeCloseTo(g[i], 6)
          const lap = V.laplacian(p, k * d)
          expect(Math.abs(lap - centralLaplacian(V, p, k * d))).toBeLessThan(1e-4 * Math.max(1, Math.abs(lap)))
        }
      })
    }
  }

  it('matches hand derivations of ΔV = f″ + (d − 1) f′/r', () => {
    // quartic a|x|² + b|x|⁴ in d = 3 at (1, 2, 2), r² = 9: ΔV = 2ad + 4b(d + 2) r² = 6 + 8·5·9 = 366
    expect(quarticPotential(1, 2, 3).laplacian([1, 2, 2])).toBeCloseTo(366, 12)
    // ∇V = (2a + 4b r²) x = 74 x
    const g = new Float64Array(3)
    quarticPotential(1, 2, 3).gradient([1, 2, 2], 0, g)
    expect(Array.from(g)).toEqual([74, 148, 148])
    // a r^p, d = 2, p = 3: ΔV = a p (p + d − 2) r^(p−2) = 9a r; at r = 5 with a = 2: 90
    expect(radialPowerPotential(2, 3, 2).laplacian([3, 4])).toBeCloseTo(90, 12)
    // double well b r⁴ − a r² in d = 1: V'' = 12 b x² − 2a; at x = 2, a = 1.5, b = 0.25: 12 − 3 = 9
    expect(doubleWellPotential(1.5, 0.25, 1).laplacian([2])).toBeCloseTo(9, 12)
    // quadratic: ΔV = 2ad everywhere
    expect(quadraticPotential(3, 3).laplacian([0, 0, 0])).toBe(18)
  })

  it('handles r = 0: limits, cones and blow-ups', () => {
    const g = new Float64Array(2)
    // p = 2.5: ∇V → 0 and ΔV → 0 at the origin (a p (p + d − 2) r^(p−2) → 0)
    radialPowerPotential(1, 2.5, 2).gradient([0, 0], 0, g)
    expect(Array.from(g)).toEqual([0, 0])
    expect(radialPowerPotential(1, 2.5, 2).laplacian([0, 0])).toBe(0)
    // p = 2 is the quadratic: ΔV = 2ad at the origin too
    expect(radialPowerPotential(1.5, 2, 3).laplacian([0, 0, 0])).toBeCloseTo(9, 14)
    // p = 1 (a cone): zero subgradient, infinite Laplacian
    radialPowerPotential(1, 1, 2).gradient([0, 0], 0, g)
    expect(Array.from(g)).toEqual([0, 0])
    expect(radialPowerPotential(1, 1, 2).laplacian([0, 0])).toBe(Infinity)
    // double well at the origin: ΔV = −2ad
    expect(doubleWellPotential(1, 1, 2).laplacian([0, 0])).toBe(-4)
  })

  it('gives a radial profile consistent with the values', () => {
    for (const [, make] of PRESETS) {
      const V = make(2)
      const prof = V.radialProfile
      expect(prof).toBeDefined()
      if (!prof) continue
      for (const r of [0.3, 0.9, 1.7]) {
        expect(prof.v(r)).toBeCloseTo(V.value([r * 0.6, r * 0.8]), 12)
        expect(prof.dv(r)).toBeCloseTo((prof.v(r + 1e-5) - prof.v(r - 1e-5)) / 2e-5, 6)
        expect(prof.d2v(r)).toBeCloseTo((prof.dv(r + 1e-5) - prof.dv(r - 1e-5)) / 2e-5, 5)
      }
      expect(V.radial).toBe(true)
    }
  })

  it('writes text, LaTeX and the preset record', () => {
    const q = quadraticPotential(2, 2)
    expect(q.text).toBe('2*r^2')
    expect(q.latex).toBe('2\\lvert x\\rvert^{2}')
    expect(q.preset).toEqual({ name: 'quadratic', a: 2 })
    expect(doubleWellPotential(1.5, 0.25, 1).text).toBe('0.25*r^4 - 1.5*r^2')
    expect(quarticPotential(1, 1, 2).latex).toBe('\\lvert x\\rvert^{2} + \\lvert x\\rvert^{4}')
    expect(presetPotential({ name: 'radial-power', a: 1, p: 3 }, 3).text).toBe('r^3')
  })

  it('rejects bad parameters and dimensions', () => {
    expect(() => quadraticPotential(1, 4)).toThrow(EngineInputError)
    expect(() => quadraticPotential(Number.NaN, 2)).toThrow(/finite number a/)
    expect(() => doubleWellPotential(-1, 1, 1)).toThrow(/a > 0/)
    expect(() => radialPowerPotential(1, 0, 2)).toThrow(/p > 0/)
    expect(() => quadraticPotential(1, 2).value([0, Number.NaN])).toThrow(/not a finite number/)
  })
})

describe('parsePotential', () => {
  it('reproduces the presets: values, gradients, Laplacians (symbolic derivatives)', () => {
    for (const [, make] of PRESETS) {
      for (const d of [1, 2, 3]) {
        const V = make(d)
        const P = parsePotential(V.text, { d })
        expect(P.radial).toBe(true)
        expect(P.numericalDerivatives).toEqual({ gradient: false, laplacian: false })
        const p = points(10, d, 99 + d)
        const a = new Float64Array(d)
        const b = new Float64Array(d)
        for (let k = 0; k < 10; k++) {
          expect(P.value(p, k * d)).toBeCloseTo(V.value(p, k * d), 12)
          V.gradient(p, k * d, a)
          P.gradient(p, k * d, b)
          for (let i = 0; i < d; i++) expect(b[i]).toBeCloseTo(a[i], 10)
          expect(P.laplacian(p, k * d)).toBeCloseTo(V.laplacian(p, k * d), 9)
        }
        const zero = new Float64Array(d)
        if (V.preset?.name !== 'radial-power' || V.preset.p >= 2) expect(P.laplacian(zero)).toBeCloseTo(V.laplacian(zero), 9)
      }
    }
  })

  it('binds parameters and keeps them symbolic in the canonical text', () => {
    const P = parsePotential('a*r^2 + b * x', { d: 2, parameters: { a: 2, b: -1 } })
    expect(P.text).toBe('a * r ^ 2 + b * x')
    expect(P.boundText).toBe('2 * r ^ 2 + -1 * x')
    expect(P.radial).toBe(false)
    expect(P.value([1, 2])).toBeCloseTo(2 * 5 - 1, 14)
    expect(P.latex).toBe('a\\cdot {r}^{2}+b\\cdot x')
    const g = new Float64Array(2)
    P.gradient([1, 2], 0, g)
    expect(g[0]).toBeCloseTo(4 * 1 - 1, 12)
    expect(g[1]).toBeCloseTo(4 * 2, 12)
    // Δ(2r²) = 2·2·d = 8 in d = 2
    expect(P.laplacian([1, 2])).toBeCloseTo(8, 10)
  })

  it('accepts the whitelisted functions, constants and implicit products', () => {
    const P = parsePotential('sqrt(x^2 + 1) + exp(-y^2) + log(2 + z^2) + abs(x) + sin(x) * cos(y) + tan(0.1 * z) + atan(x)'
      + ' + tanh(y) + cosh(0.5 z) + sinh(0.2 x) + pow(r, 3) + 2 pi + e', { d: 3 })
    const [x, y, z] = [0.3, -0.7, 1.1]
    const r = Math.hypot(x, y, z)
    const expected = Math.sqrt(x * x + 1) + Math.exp(-y * y) + Math.log(2 + z * z) + Math.abs(x) + Math.sin(x) * Math.cos(y)
      + Math.tan(0.1 * z) + Math.atan(x) + Math.tanh(y) + Math.cosh(0.5 * z) + Math.sinh(0.2 * x) + r ** 3 + 2 * Math.PI + Math.E
    expect(P.value([x, y, z])).toBeCloseTo(expected, 12)
    const g = new Float64Array(3)
    P.gradient([x, y, z], 0, g)
    const h = 1e-5
    const num = [0, 1, 2].map((i) => {
      const up = [x, y, z]
      const dn = [x, y, z]
      up[i] += h
      dn[i] -= h
      return (P.value(up) - P.value(dn)) / (2 * h)
    })
    for (let i = 0; i < 3; i++) expect(g[i]).toBeCloseTo(num[i], 6)
    expect(P.laplacian([x, y, z])).toBeCloseTo(centralLaplacian(P, Float64Array.from([x, y, z]), 0), 3)
  })

  it('marks r-only expressions radial and supplies their profile', () => {
    const P = parsePotential('r^4 - 2*r^2 + log(1 + r^2)', { d: 2 })
    expect(P.radial).toBe(true)
    const prof = P.radialProfile
    expect(prof).toBeDefined()
    if (!prof) return
    const r = 0.8
    expect(prof.dv(r)).toBeCloseTo(4 * r ** 3 - 4 * r + 2 * r / (1 + r * r), 12)
    expect(prof.d2v(r)).toBeCloseTo(12 * r * r - 4 + (2 - 2 * r * r) / (1 + r * r) ** 2, 12)
    // ΔV at the origin = d·f″(0) = 2·(−4 + 2) = −4
    expect(P.laplacian([0, 0])).toBeCloseTo(-4, 10)
    expect(parsePotential('x^2', { d: 1 }).radial).toBe(false)
  })

  it('writes LaTeX in one pass', () => {
    expect(parsePotential('a*r^2 + log(1 + r^2)', { d: 2, parameters: { a: 1 } }).latex).toBe('a\\cdot {r}^{2}+\\ln\\left(1+{r}^{2}\\right)')
    expect(parsePotential('(x+1)^2/(3*x) - sqrt(abs(x))', { d: 1 }).latex)
      .toBe('\\frac{{\\left(x+1\\right)}^{2}}{3\\cdot x}-\\sqrt{\\left|x\\right|}')
    expect(parsePotential('2 pi x * 1e-7', { d: 1 }).latex).toBe('2\\,\\pi\\,x\\cdot 1\\times 10^{-7}')
  })

  it('falls back to finite differences for min and max, and for abs at its kink', () => {
    const P = parsePotential('max(x^2, 1 - x) + min(y, 2)', { d: 2 })
    expect(P.numericalDerivatives.gradient).toBe(true)
    const g = new Float64Array(2)
    P.gradient([1.5, 0.5], 0, g)
    expect(g[0]).toBeCloseTo(3, 8)
    expect(g[1]).toBeCloseTo(1, 8)
    expect(P.laplacian([1.5, 0.5])).toBeCloseTo(2, 5)
    const Q = parsePotential('abs(x)^3', { d: 1 })
    const q = new Float64Array(1)
    Q.gradient([0], 0, q)
    expect(q[0]).toBeCloseTo(0, 8)
    Q.gradient([-2], 0, q)
    expect(q[0]).toBeCloseTo(-12, 10)
  })

  const REJECTED: Array<[string, RegExp, number | undefined, number?]> = [
    ['x = 2', /assignments/, 3],
    ['x == 2', /assignments and comparisons/, 3],
    ['f(x) = x^2', /function f/, 1],
    ['import(x)', /function import/, 1],
    ['createUnit(x)', /function createUnit/, 1],
    ['evaluate(x)', /function evaluate/, 1],
    ['parse(x)', /function parse/, 1],
    ['x + [1, 2]', /arrays/, 5],
    ['{a: 1}', /objects/, 1],
    ['1:3', /ranges/, 2],
    ['x ? 1 : 2', /conditionals/, 3],
    ['x + "s"', /strings/, 5],
    ['foo + 1', /unknown symbol foo/, 1],
    ['x + y', /y is not a coordinate in dimension 1/, 5],
    ['x(2)', /x is not a function/, 1],
    ['x.re', /property access/, 2],
    ['2 x!', /factorials/, 4],
    ['x; 2', /only one expression/, 2],
    ['x\n2', /only one expression/, 2],
    ['x\'', /transposes/, 2],
    ['x mod 2', /unknown symbol mod/, 3],
    ['1e999 * x', /not finite/, 1],
    ['sin(x, 2)', /sin\(…\) takes 1 argument/, 1],
    ['pow(x)', /pow\(…\) takes 2 argument/, 1],
    ['sqrt + x', /must be called/, 1],
    ['x +', /could not be read/, 4],
    ['x & 1', /bitwise/, 3],
    ['(x', /unbalanced/, 1],
    ['x)', /unbalanced/, 2],
  ]
  for (const [text, message, column] of REJECTED) {
    it(`rejects ${JSON.stringify(text)} with its position`, () => {
      let caught: unknown
      try {
        parsePotential(text, { d: 1 })
      }
      catch (err) {
        caught = err
      }
      expect(caught).toBeInstanceOf(EngineInputError)
      const err = caught as EngineInputError
      expect(err.message).toMatch(message)
      expect(err.where.column).toBe(column)
      expect(err.message).toContain(`at character ${column}`)
    })
  }

  it('bounds the size: length, nodes and nesting depth', () => {
    expect(() => parsePotential('x+'.repeat(250) + 'x', { d: 1 })).toThrow(/longer than 500/)
    expect(() => parsePotential('x+'.repeat(150) + 'x', { d: 1 })).toThrow(/more than 200 nodes/)
    expect(() => parsePotential('('.repeat(41) + 'x' + ')'.repeat(41), { d: 1 })).toThrow(/nested deeper than 40/)
    expect(() => parsePotential('x^'.repeat(45) + 'x', { d: 1 })).toThrow(/nested deeper than 40/)
    expect(parsePotential('('.repeat(20) + 'x' + ')'.repeat(20), { d: 1 }).value([3])).toBe(3)
    // deeply nested calls within the limit are fine (39 levels of sin)
    const nested = parsePotential('sin('.repeat(39) + 'x' + ')'.repeat(39), { d: 1 })
    let v = 0.5
    for (let k = 0; k < 39; k++) v = Math.sin(v)
    expect(nested.value([0.5])).toBeCloseTo(v, 14)
    // a long sum is a chain, not a nesting: 61 terms are fine
    expect(parsePotential('x+'.repeat(60) + 'x', { d: 1 }).value([2])).toBe(122)
  })

  it('checks parameters and evaluation', () => {
    expect(() => parsePotential('x', { d: 1, parameters: { x: 1 } })).toThrow(/reserved/)
    expect(() => parsePotential('a*x', { d: 1, parameters: { a: Number.NaN } })).toThrow(/finite number/)
    expect(() => parsePotential('x', { d: 1, parameters: { '1a': 1 } })).toThrow(/not a valid name/)
    expect(() => parsePotential('', { d: 1 })).toThrow(/empty/)
    expect(() => parsePotential('x', { d: 4 })).toThrow(/d = 1, 2 or 3/)
    let caught: unknown
    try {
      parsePotential('sqrt(x)', { d: 2 }).value([1, 1, -1, 0], 2)
    }
    catch (err) {
      caught = err
    }
    expect(caught).toBeInstanceOf(EngineInputError)
    expect((caught as EngineInputError).where.index).toBe(1)
    expect((caught as EngineInputError).message).toMatch(/undefined \(NaN\) at the point with index 1/)
    // +∞ is a legitimate value (an infinite wall), not an error
    expect(parsePotential('-log(r)', { d: 2 }).value([0, 0])).toBe(Infinity)
  })
})
