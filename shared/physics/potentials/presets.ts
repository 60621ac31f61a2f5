// Preset radial external potentials V(x) = f(|x|) on R^d, d = 1, 2, 3, with exact derivatives:
//   quadratic    f(r) = a r²                 ∇V = 2a x,               ΔV = 2ad
//   quartic      f(r) = a r² + b r⁴          ∇V = (2a + 4b r²) x,     ΔV = 2ad + 4b(d + 2) r²
//   double well  f(r) = b r⁴ − a r²          ∇V = (4b r² − 2a) x,     ΔV = −2ad + 4b(d + 2) r²
//   radial power f(r) = a r^p                ∇V = a p r^(p−2) x,      ΔV = a p (p + d − 2) r^(p−2)
// from ∇f(|x|) = f'(r) x/r and Δf(|x|) = f''(r) + (d − 1) f'(r)/r (the Laplacian in polar coordinates;
// Evans, Partial Differential Equations, 2nd ed. 2010, §2.2.1). At r = 0 the limits are used; a cone
// (p = 1) gets the zero subgradient and p < 2 an infinite Laplacian.
import { EngineInputError } from '../errors'
import type { Potential, PotentialPreset } from './types'

function checkDimension(d: number): void {
  if (d !== 1 && d !== 2 && d !== 3) throw new EngineInputError(`a potential needs dimension d = 1, 2 or 3 (got ${d})`)
}

function checkParameter(name: string, value: number, preset: string, positive = false): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new EngineInputError(`the ${preset} potential needs a finite number ${name} (got ${String(value)})`)
  if (positive && !(value > 0)) throw new EngineInputError(`the ${preset} potential needs ${name} > 0 (got ${value})`)
}

/** Shortest exact decimal for a number in text (e.g. 2, 0.5, 1e-7). */
function num(x: number): string {
  return String(x)
}

/** LaTeX for a number: 1e-7 → 1\times 10^{-7}. */
function texNum(x: number): string {
  const s = String(x)
  const m = /^(-?[\d.]+)e([+-]?\d+)$/.exec(s)
  if (m) return `${m[1]}\\times 10^{${Number(m[2])}}`
  return s
}

const ABS_X = '\\lvert x\\rvert'

function texTerm(coef: number, power: number, first: boolean): string {
  const mag = Math.abs(coef)
  const sign = coef < 0 ? (first ? '-' : ' - ') : (first ? '' : ' + ')
  const c = mag === 1 ? '' : texNum(mag)
  return `${sign}${c}${ABS_X}^{${texNum(power)}}`
}

function textTerm(coef: number, power: number, first: boolean): string {
  const sign = coef < 0 ? (first ? '-' : ' - ') : (first ? '' : ' + ')
  const mag = Math.abs(coef)
  return `${sign}${mag === 1 ? '' : `${num(mag)}*`}r^${num(power)}`
}

interface RadialSpec {
  d: number
  text: string
  latex: string
  preset: PotentialPreset
  v(r: number): number
  dv(r: number): number
  d2v(r: number): number
  /** f'(r)/r, with its limit at r = 0. */
  dvOverR(r: number): number
  /** ΔV as a function of r, with its limit at r = 0. */
  laplacian(r: number): number
}

function readRadius(points: ArrayLike<number>, offset: number, d: number): number {
  let r2 = 0
  for (let i = 0; i < d; i++) {
    const c = points[offset + i]
    if (typeof c !== 'number' || !Number.isFinite(c)) {
      throw new EngineInputError(`coordinate ${i} of the point at offset ${offset} is not a finite number`, { index: Math.floor(offset / d) })
    }
    r2 += c * c
  }
  return Math.sqrt(r2)
}

function radialPotential(spec: RadialSpec): Potential {
  const { d } = spec
  return {
    d,
    text: spec.text,
    latex: spec.latex,
    preset: spec.preset,
    radial: true,
    value(points, offset = 0) {
      return spec.v(readRadius(points, offset, d))
    },
    gradient(points, offset, out) {
      const k = spec.dvOverR(readRadius(points, offset, d))
      for (let i = 0; i < d; i++) out[i] = k * points[offset + i]
    },
    laplacian(points, offset = 0) {
      return spec.laplacian(readRadius(points, offset, d))
    },
    radialProfile: { v: spec.v, dv: spec.dv, d2v: spec.d2v },
  }
}

/** V(x) = a|x|². */
export function quadraticPotential(a: number, d: number): Potential {
  checkDimension(d)
  checkParameter('a', a, 'quadratic')
  return radialPotential({
    d,
    text: textTerm(a, 2, true),
    latex: texTerm(a, 2, true),
    preset: { name: 'quadratic', a },
    v: r => a * r * r,
    dv: r => 2 * a * r,
    d2v: () => 2 * a,
    dvOverR: () => 2 * a,
    laplacian: () => 2 * a * d,
  })
}

function quarticLike(a2: number, b4: number, d: number, preset: PotentialPreset, text: string, latex: string): Potential {
  // f(r) = a2 r² + b4 r⁴
  return radialPotential({
    d,
    text,
    latex,
    preset,
    v: r => a2 * r * r + b4 * r * r * r * r,
    dv: r => 2 * a2 * r + 4 * b4 * r * r * r,
    d2v: r => 2 * a2 + 12 * b4 * r * r,
    dvOverR: r => 2 * a2 + 4 * b4 * r * r,
    laplacian: r => 2 * a2 * d + 4 * b4 * (d + 2) * r * r,
  })
}

/** V(x) = a|x|² + b|x|⁴. */
export function quarticPotential(a: number, b: number, d: number): Potential {
  checkDimension(d)
  checkParameter('a', a, 'quartic')
  checkParameter('b', b, 'quartic')
  return quarticLike(a, b, d, { name: 'quartic', a, b },
    textTerm(a, 2, true) + textTerm(b, 4, false),
    texTerm(a, 2, true) + texTerm(b, 4, false))
}

/** V(x) = b|x|⁴ − a|x|² with a, b > 0 (two wells at |x|² = a/(2b)). */
export function doubleWellPotential(a: number, b: number, d: number): Potential {
  checkDimension(d)
  checkParameter('a', a, 'double-well', true)
  checkParameter('b', b, 'double-well', true)
  return quarticLike(-a, b, d, { name: 'double-well', a, b },
    textTerm(b, 4, true) + textTerm(-a, 2, false),
    texTerm(b, 4, true) + texTerm(-a, 2, false))
}

/** V(x) = a|x|^p with p > 0. */
export function radialPowerPotential(a: number, p: number, d: number): Potential {
  checkDimension(d)
  checkParameter('a', a, 'radial-power')
  checkParameter('p', p, 'radial-power', true)
  const lapCoef = a * p * (p + d - 2)
  return radialPotential({
    d,
    text: textTerm(a, p, true),
    latex: texTerm(a, p, true),
    preset: { name: 'radial-power', a, p },
    v: r => a * Math.pow(r, p),
    dv: r => (r === 0 ? (p > 1 ? 0 : p === 1 ? a : Math.sign(a) * Infinity) : a * p * Math.pow(r, p - 1)),
    d2v: r => (p === 1 || p === 2 ? a * p * (p - 1) : r === 0 ? (p > 2 ? 0 : Math.sign(a * (p - 1)) * Infinity) : a * p * (p - 1) * Math.pow(r, p - 2)),
    dvOverR: (r) => {
      if (r > 0) return a * p * Math.pow(r, p - 2)
      if (p > 2) return 0
      if (p === 2) return 2 * a
      if (p === 1) return 0 // zero subgradient at the tip of the cone
      return Math.sign(a) * Infinity
    },
    laplacian: (r) => {
      if (p === 2) return 2 * a * d
      if (r > 0) return lapCoef * Math.pow(r, p - 2)
      if (p > 2) return 0
      // r = 0, p < 2: the Laplacian blows up (a point mass 2a δ₀ when d = 1, p = 1)
      return (lapCoef !== 0 ? Math.sign(lapCoef) : Math.sign(a)) * Infinity
    },
  })
}

/** The Potential of a preset in dimension d. */
export function presetPotential(preset: PotentialPreset, d: number): Potential {
  switch (preset.name) {
    case 'quadratic': return quadraticPotential(preset.a, d)
    case 'quartic': return quarticPotential(preset.a, preset.b, d)
    case 'double-well': return doubleWellPotential(preset.a, preset.b, d)
    case 'radial-power': return radialPowerPotential(preset.a, preset.p, d)
  }
}
