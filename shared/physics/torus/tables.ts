// Fast evaluation of the real-space Ewald functions by piecewise Chebyshev interpolation, for the
// pair loops of ewald.ts (millions of evaluations; the series and continued fractions of
// special-functions.ts cost 30–200 operations each). On each of P equal pieces of [a, b] the
// function is interpolated at the n + 1 Chebyshev points of the first kind and evaluated by the
// Clenshaw recurrence (common practice; Trefethen, Approximation Theory and Approximation Practice,
// SIAM 2013, ch. 3–8: for a function analytic in a Bernstein ellipse of parameter ρ the error decays
// like ρ^{−n}). The interpolated functions here are entire:
//   2-D (x = α r², ψ_α = ½E₁(x)): ½(E₁(x) + log x) on [0, 1] and eˣE₁(x) from 1 on;
//   3-D and the sheet (y = √α r, ψ_α = erfc(y)/r): e^{y²} erfc(y).
// The scaled forms keep the relative error of ψ_α near 1e−15 also where it is tiny (near the cut-off),
// so the real-space sum errs by about that times the sum of its terms' sizes.
// Each table is checked at build time against the function at the midpoints between the nodes
// (where the interpolation error peaks), and the largest deviation is kept with the table.
import { expint1, erfc } from './special-functions'

export interface ChebyshevTable {
  readonly a: number
  readonly b: number
  readonly pieces: number
  readonly degree: number
  /** Largest |table − f| and |table − f|/|f| found at 4 points between every two nodes. */
  readonly checkedError: number
  readonly checkedRelativeError: number
  readonly coefficients: Float64Array
  evaluate(x: number): number
}

export function chebyshevTable(f: (x: number) => number, a: number, b: number, pieces: number, degree: number): ChebyshevTable {
  const n = degree + 1
  const width = (b - a) / pieces
  const coefficients = new Float64Array(pieces * n)
  const values = new Float64Array(n)
  for (let p = 0; p < pieces; p++) {
    const lo = a + p * width
    for (let k = 0; k < n; k++) values[k] = f(lo + 0.5 * width * (1 + Math.cos((Math.PI * (k + 0.5)) / n)))
    for (let j = 0; j < n; j++) {
      let s = 0
      for (let k = 0; k < n; k++) s += values[k] * Math.cos((Math.PI * j * (k + 0.5)) / n)
      coefficients[p * n + j] = ((j === 0 ? 1 : 2) / n) * s
    }
  }
  const scale = pieces / (b - a)
  const evaluate = (x: number): number => {
    let p = Math.floor((x - a) * scale)
    if (p < 0) p = 0
    else if (p >= pieces) p = pieces - 1
    const t = 2 * ((x - a) * scale - p) - 1
    const o = p * n
    // Clenshaw
    let b1 = 0
    let b2 = 0
    for (let j = n - 1; j >= 1; j--) {
      const b0 = 2 * t * b1 - b2 + coefficients[o + j]
      b2 = b1
      b1 = b0
    }
    return t * b1 - b2 + coefficients[o]
  }
  let checkedError = 0
  let checkedRelativeError = 0
  for (let p = 0; p < pieces; p++) {
    for (let q = 0; q < 4 * n; q++) {
      const x = a + (p + (q + 0.5) / (4 * n)) * width
      const fx = f(x)
      const e = Math.abs(evaluate(x) - fx)
      checkedError = Math.max(checkedError, e)
      if (fx !== 0) checkedRelativeError = Math.max(checkedRelativeError, e / Math.abs(fx))
    }
  }
  return { a, b, pieces, degree, checkedError, checkedRelativeError, coefficients, evaluate }
}

/** ½(E₁(x) + log x) on [0, 1] (its value at 0 is −γ/2): ψ = that − ½ log x below x = 1, where
 *  ψ ≥ ½E₁(1) ≈ 0.11, so the subtraction keeps the relative accuracy. */
export function halfExpintPlusLogTable(): ChebyshevTable {
  const gamma = 0.57721566490153286060651209
  const f = (x: number): number => (x === 0 ? -0.5 * gamma : x < 1e-8 ? 0.5 * (-gamma + x - (x * x) / 4) : 0.5 * (expint1(x) + Math.log(x)))
  return cached('e1log', () => chebyshevTable(f, 0, 1, 4, 14))
}

/** eˣE₁(x) on [1, xmax] (smooth, about 1/(x + 1)): ψ = ½e^{−x} times that from x = 1 on. */
export function scaledExpintTable(xmax: number): ChebyshevTable {
  return cached(`e1x:${xmax}`, () => chebyshevTable(x => Math.exp(x) * expint1(x), 1, Math.max(2, xmax), Math.max(8, Math.ceil(4 * xmax)), 14))
}

/** e^{y²} erfc(y) on [0, ymax] (smooth, about 1/(√π y) for large y): erfc(y) = e^{−y²} times that. */
export function scaledErfcTable(ymax: number): ChebyshevTable {
  return cached(`erfcx:${ymax}`, () => chebyshevTable(y => Math.exp(y * y) * erfc(y), 0, ymax, Math.max(8, Math.ceil(ymax * 6)), 14))
}

const tables = new Map<string, ChebyshevTable>()
function cached(key: string, build: () => ChebyshevTable): ChebyshevTable {
  const known = tables.get(key)
  if (known) return known
  const t = build()
  if (tables.size > 16) tables.clear()
  tables.set(key, t)
  return t
}
