// Least-squares fit of the finite-N expansion of the energy per point,
//   e(N) ≈ a + b·(log N)/N + c/N,
// by Householder QR of the (optionally weighted) design matrix, which avoids squaring the
// condition number as the normal equations would (Golub & Van Loan, Matrix Computations,
// 4th ed., 2013, §5.3). Weights w_i multiply the squared residuals (w_i = 1/σ_i² for error bars).
import { EngineInputError } from '../physics/errors'
import { CompensatedSum } from '../physics/summation'

export const expansionModel = 'a + b·log N/N + c/N'

export interface ExpansionFit {
  model: string
  a: number
  b: number
  c: number
  /** Root mean square of the (unweighted) residuals. */
  residualRms: number
  points: number
}

/** Solves min Σ w_i (y_i − Σ_k X_ik β_k)² for a tall matrix given by columns. */
export function leastSquares(columns: Float64Array[], y: ArrayLike<number>, weights?: ArrayLike<number>): Float64Array {
  const m = y.length
  const p = columns.length
  if (m < p) throw new EngineInputError(`least squares: ${m} points cannot fix ${p} coefficients`)
  const A = columns.map((col, k) => {
    if (col.length !== m) throw new EngineInputError(`least squares: column ${k} has ${col.length} entries, expected ${m}`)
    return Float64Array.from(col)
  })
  const r = Float64Array.from(y)
  if (weights) {
    for (let i = 0; i < m; i++) {
      const w = weights[i]
      if (!(w > 0) || !Number.isFinite(w)) throw new EngineInputError(`least squares: weight ${w} is not a positive number`, { index: i })
      const s = Math.sqrt(w)
      r[i] *= s
      for (let k = 0; k < p; k++) A[k][i] *= s
    }
  }
  const scale = A.map(col => Math.sqrt(col.reduce((acc, v) => acc + v * v, 0)))
  for (let k = 0; k < p; k++) {
    const col = A[k]
    let norm2 = 0
    for (let i = k; i < m; i++) norm2 += col[i] * col[i]
    const norm = Math.sqrt(norm2)
    if (!(norm > 1e-12 * scale[k])) throw new EngineInputError(`least squares: the design matrix is rank deficient (column ${k})`)
    const alpha = col[k] > 0 ? -norm : norm
    const v = new Float64Array(m)
    for (let i = k; i < m; i++) v[i] = col[i]
    v[k] -= alpha
    let vv = 0
    for (let i = k; i < m; i++) vv += v[i] * v[i]
    if (vv === 0) continue
    const reflect = (x: Float64Array) => {
      let d = 0
      for (let i = k; i < m; i++) d += v[i] * x[i]
      const f = (2 * d) / vv
      for (let i = k; i < m; i++) x[i] -= f * v[i]
    }
    for (let j = k; j < p; j++) reflect(A[j])
    reflect(r)
  }
  const beta = new Float64Array(p)
  for (let k = p - 1; k >= 0; k--) {
    let s = r[k]
    for (let j = k + 1; j < p; j++) s -= A[j][k] * beta[j]
    beta[k] = s / A[k][k]
  }
  return beta
}

/** Fits a + b·log N/N + c/N to (N_i, e_i); needs at least three distinct N. */
export function fitEnergyExpansion(N: ArrayLike<number>, e: ArrayLike<number>, weights?: ArrayLike<number>): ExpansionFit {
  const m = N.length
  if (e.length !== m) throw new EngineInputError(`expansion fit: ${m} values of N but ${e.length} energies`)
  const one = new Float64Array(m)
  const logTerm = new Float64Array(m)
  const invTerm = new Float64Array(m)
  for (let i = 0; i < m; i++) {
    const n = N[i]
    if (!(n > 0) || !Number.isFinite(n)) throw new EngineInputError(`expansion fit: N = ${n} is not a positive number`, { index: i })
    if (!Number.isFinite(e[i])) throw new EngineInputError(`expansion fit: energy ${e[i]} is not finite`, { index: i })
    one[i] = 1
    logTerm[i] = Math.log(n) / n
    invTerm[i] = 1 / n
  }
  if (new Set(Array.from(N)).size < 3) throw new EngineInputError('expansion fit: needs at least three distinct values of N')
  const [a, b, c] = leastSquares([one, logTerm, invTerm], e, weights)
  const rss = new CompensatedSum()
  for (let i = 0; i < m; i++) {
    const d = e[i] - evaluateExpansion({ a, b, c }, N[i])
    rss.add(d * d)
  }
  return { model: expansionModel, a, b, c, residualRms: Math.sqrt(rss.value / m), points: m }
}

export function evaluateExpansion(fit: { a: number, b: number, c: number }, N: number): number {
  return fit.a + (fit.b * Math.log(N)) / N + fit.c / N
}
