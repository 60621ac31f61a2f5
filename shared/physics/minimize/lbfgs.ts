// Limited-memory BFGS with a strong-Wolfe line search (Nocedal & Wright, Numerical Optimization, 2nd ed.,
// 2006): the search direction −H_k ∇f comes from the two-loop recursion (Algorithm 7.4) over the last m
// pairs s = x_{k+1} − x_k, y = ∇f_{k+1} − ∇f_k, with the initial scaling H⁰ = (sᵀy / yᵀy) I (eq. 7.20);
// the outer loop is Algorithm 7.5. The step length satisfies the strong Wolfe conditions
//   f(x + αp) ≤ f(x) + c₁ α ∇fᵀp,   |∇f(x + αp)ᵀp| ≤ c₂ |∇fᵀp|,   c₁ = 1e−4, c₂ = 0.9,
// found by the bracketing phase (Algorithm 3.5) and the zoom phase (Algorithm 3.6) with safeguarded
// cubic interpolation (§3.5, eq. 3.59). A pair with sᵀy ≤ 0 is not stored (the curvature condition).
import { EngineInputError } from '../errors'

/** f(x), with ∇f(x) written into grad. Return NaN or ∞ where f is not defined (the line search backs off). */
export type Objective = (x: Float64Array, grad: Float64Array) => number

export interface LbfgsOptions {
  /** Number of stored pairs m (default 8). */
  readonly memory?: number
  /** Maximum number of iterations (default 2000). */
  readonly maxIterations?: number
  /** Stop when max_k |∇f_k| ≤ this (default 1e−10). */
  readonly gradientTolerance?: number
  /** Stop when an iteration lowers f by at most this times |f| (default 1e−15). */
  readonly functionTolerance?: number
  /** Largest length of the first trial step ‖αp‖ (default 1, bounded moves for pair energies). */
  readonly maxStepLength?: number
}

export interface LbfgsResult {
  readonly x: Float64Array
  readonly f: number
  /** max_k |∇f_k| at x. */
  readonly gradientNorm: number
  readonly iterations: number
  readonly evaluations: number
  readonly converged: boolean
  readonly reason: 'gradient' | 'function' | 'iterations' | 'line-search'
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0
  for (let k = 0; k < a.length; k++) s += a[k] * b[k]
  return s
}

function maxAbs(a: Float64Array): number {
  let m = 0
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]))
  return m
}

/** The minimiser of the cubic through (a, fa, ga), (b, fb, gb) (eq. 3.59), or the midpoint if undefined. */
function cubicMinimiser(a: number, fa: number, ga: number, b: number, fb: number, gb: number): number {
  const d1 = ga + gb - (3 * (fa - fb)) / (a - b)
  const disc = d1 * d1 - ga * gb
  if (disc < 0) return (a + b) / 2
  const d2 = Math.sign(b - a) * Math.sqrt(disc)
  const t = b - (b - a) * ((gb + d2 - d1) / (gb - ga + 2 * d2))
  return Number.isFinite(t) ? t : (a + b) / 2
}

/** Minimises f from x0. */
export function lbfgs(f: Objective, x0: Float64Array, options: LbfgsOptions = {}): LbfgsResult {
  const n = x0.length
  const m = options.memory ?? 8
  const maxIter = options.maxIterations ?? 2000
  const gtol = options.gradientTolerance ?? 1e-10
  const ftol = options.functionTolerance ?? 1e-15
  const maxStep = options.maxStepLength ?? 1
  if (!Number.isInteger(m) || m < 1) throw new EngineInputError(`the L-BFGS memory must be an integer ≥ 1 (got ${m})`)
  const c1 = 1e-4
  const c2 = 0.9
  let x = Float64Array.from(x0)
  let g = new Float64Array(n)
  let fx = f(x, g)
  let evaluations = 1
  if (!Number.isFinite(fx)) throw new EngineInputError(`the objective is not finite at the starting point (${fx})`)
  const S: Float64Array[] = []
  const Y: Float64Array[] = []
  const rho: number[] = []
  const p = new Float64Array(n)
  const alphaHist = new Float64Array(m)
  let xt = new Float64Array(n)
  let gt = new Float64Array(n)
  let iterations = 0
  let reason: LbfgsResult['reason'] = 'iterations'
  while (iterations < maxIter) {
    if (maxAbs(g) <= gtol) {
      reason = 'gradient'
      break
    }
    // two-loop recursion (Algorithm 7.4)
    for (let k = 0; k < n; k++) p[k] = -g[k]
    for (let j = S.length - 1; j >= 0; j--) {
      const a = rho[j] * dot(S[j], p)
      alphaHist[j] = a
      const y = Y[j]
      for (let k = 0; k < n; k++) p[k] -= a * y[k]
    }
    if (S.length > 0) {
      const last = S.length - 1
      const gamma = dot(S[last], Y[last]) / dot(Y[last], Y[last])
      for (let k = 0; k < n; k++) p[k] *= gamma
    }
    for (let j = 0; j < S.length; j++) {
      const b = rho[j] * dot(Y[j], p)
      const s = S[j]
      const a = alphaHist[j]
      for (let k = 0; k < n; k++) p[k] += (a - b) * s[k]
    }
    let slope = dot(g, p)
    if (!(slope < 0)) {
      // not a descent direction: restart from steepest descent
      S.length = 0
      Y.length = 0
      rho.length = 0
      for (let k = 0; k < n; k++) p[k] = -g[k]
      slope = dot(g, p)
    }
    const pNorm = Math.sqrt(dot(p, p))
    let alpha1 = Math.min(1, maxStep / pNorm)
    if (!(alpha1 > 0)) alpha1 = 1
    // strong-Wolfe line search (Algorithms 3.5 and 3.6)
    const phi = (alpha: number): [number, number] => {
      for (let k = 0; k < n; k++) xt[k] = x[k] + alpha * p[k]
      const v = f(xt, gt)
      evaluations++
      return [v, Number.isFinite(v) ? dot(gt, p) : NaN]
    }
    let found = false
    let aPrev = 0
    let fPrev = fx
    let gPrev = slope
    let aCur = alpha1
    let fNew = NaN
    const zoom = (lo: number, flo: number, glo: number, hi: number, fhi: number, ghi: number): boolean => {
      for (let k = 0; k < 60; k++) {
        let a = Number.isFinite(fhi) && Number.isFinite(ghi) ? cubicMinimiser(lo, flo, glo, hi, fhi, ghi) : (lo + hi) / 2
        const left = Math.min(lo, hi)
        const right = Math.max(lo, hi)
        const width = right - left
        if (!(a > left + 0.1 * width && a < right - 0.1 * width)) a = (lo + hi) / 2
        const [fa, ga] = phi(a)
        if (!Number.isFinite(fa) || fa > fx + c1 * a * slope || fa >= flo) {
          hi = a
          fhi = fa
          ghi = ga
        }
        else {
          if (Math.abs(ga) <= -c2 * slope) {
            fNew = fa
            return true
          }
          if (ga * (hi - lo) >= 0) {
            hi = lo
            fhi = flo
            ghi = glo
          }
          lo = a
          flo = fa
          glo = ga
        }
        if (Math.abs(hi - lo) <= 1e-16 * Math.max(1, Math.abs(lo))) break
      }
      // accept the best sufficient-decrease point found, if any
      if (lo > 0 && flo < fx) {
        const [fa] = phi(lo)
        fNew = fa
        return true
      }
      return false
    }
    for (let trial = 0; trial < 40; trial++) {
      const [fa, ga] = phi(aCur)
      if (!Number.isFinite(fa)) {
        // undefined there: shrink the step
        if (!zoom(aPrev, fPrev, gPrev, aCur, fa, ga)) break
        found = true
        break
      }
      if (fa > fx + c1 * aCur * slope || (trial > 0 && fa >= fPrev)) {
        found = zoom(aPrev, fPrev, gPrev, aCur, fa, ga)
        break
      }
      if (Math.abs(ga) <= -c2 * slope) {
        fNew = fa
        found = true
        break
      }
      if (ga >= 0) {
        found = zoom(aCur, fa, ga, aPrev, fPrev, gPrev)
        break
      }
      aPrev = aCur
      fPrev = fa
      gPrev = ga
      aCur *= 2
    }
    if (!found) {
      reason = 'line-search'
      break
    }
    // xt, gt hold the accepted point
    const s = new Float64Array(n)
    const y = new Float64Array(n)
    for (let k = 0; k < n; k++) {
      s[k] = xt[k] - x[k]
      y[k] = gt[k] - g[k]
    }
    const sy = dot(s, y)
    if (sy > 1e-300) {
      if (S.length === m) {
        S.shift()
        Y.shift()
        rho.shift()
      }
      S.push(s)
      Y.push(y)
      rho.push(1 / sy)
    }
    const decrease = fx - fNew
    const tmpX = x
    x = xt
    xt = tmpX
    const tmpG = g
    g = gt
    gt = tmpG
    fx = fNew
    iterations++
    if (decrease <= ftol * Math.abs(fx)) {
      reason = maxAbs(g) <= gtol ? 'gradient' : 'function'
      break
    }
  }
  const gradientNorm = maxAbs(g)
  return { x, f: fx, gradientNorm, iterations, evaluations, converged: reason === 'gradient' || (reason === 'function' && gradientNorm <= Math.sqrt(gtol)), reason }
}
