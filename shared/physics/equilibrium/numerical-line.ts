// Equilibrium measure of the 1-D log kernel g(x) = −log|x| for a smooth confining V on R, supported on a
// union of intervals [a_1, b_1] ∪ … ∪ [a_J, b_J] (Euler–Lagrange conditions h^μ + V/2 = c_V on the support,
// ≥ outside: Saff & Totik, Logarithmic Potentials with External Fields, 1997, ch. I, with their Q = V/2).
//
// Method (Chebyshev collocation of the Euler–Lagrange equation with soft-edge endpoint conditions):
//   on interval j write y = m_j + h_j s and dμ(y) = Σ_n d_{j,n} T_n(s) / √(1 − s²) dy.
//   The expansion log|t − s| = −log 2 − 2 Σ_{n≥1} T_n(t) T_n(s)/n for |t|, |s| ≤ 1 and, for |t| > 1 with
//   w = |t| + √(t² − 1), log|t − s| = log(w/2) − 2 Σ_{n≥1} sgn(t)ⁿ w^{−n} T_n(s)/n
//   (Mason & Handscomb, Chebyshev Polynomials, 2003, generating functions of T_n) give h^μ in closed form:
//     ∫_{−1}^{1} log|t − s| T_n(s)/√(1−s²) ds = −π T_n(t)/n (|t| ≤ 1), −π sgn(t)ⁿ w^{−n}/n (|t| > 1), n ≥ 1;
//     and −π log 2, resp. π log(w/2), for n = 0.
//   For fixed endpoints the coefficients and one common constant c solve the linear collocation system
//   h^μ + V/2 = c at Chebyshev points of every interval, with total mass 1. The endpoints are then moved by
//   Newton's method until the density is bounded, i.e. Σ_n d_{j,n}(±1)ⁿ = 0 at every endpoint (the regular,
//   soft-edge case of Saff & Totik, Logarithmic Potentials with External Fields, 1997, ch. IV, and Deift,
//   Orthogonal Polynomials and Random Matrices, 1999, ch. 6). The number of intervals is found by trying one
//   cut and the pieces of the sublevel sets {V ≤ min V + δ}, then splitting where the density comes out
//   negative or adding a cut where ζ < 0 outside the support, and accepting the first candidate with
//   density ≥ 0 and ζ ≥ 0 (checked on a grid). The degree is doubled until the endpoints stop moving; the
//   reported accuracy is the largest of the Euler–Lagrange residual off the collocation points, the gap
//   between the two computations of c_V and that last endpoint shift. Non-smooth V (e.g. |x|) converge
//   slowly and report a correspondingly large accuracy.
import type { Potential } from '../potentials/types'
import { EngineInputError } from '../errors'
import { ENGINE_VERSION } from '../version'
import { gaussChebyshevFirst } from '../quadrature'
import type { EquilibriumMeasure } from './types'

export interface LineSolverOptions {
  /** A box [L, R] that contains the support (default: grown from [−1, 1] until V clearly dominates log|x|). */
  box?: [number, number]
  /** Target for the Euler–Lagrange residual (default 1e-11). */
  tolerance?: number
  /** Largest number of Chebyshev coefficients per interval (default 256). */
  maxDegree?: number
  /** Largest number of intervals tried (default 4). */
  maxIntervals?: number
}

export interface LineEquilibriumMeasure extends EquilibriumMeasure {
  readonly engineVersion: string
  /** Mass of μ_V carried by each interval of the support. */
  readonly intervalMasses: number[]
  /** Chebyshev coefficients per interval used by the solution. */
  readonly degree: number
}

const SOURCE = 'Chebyshev collocation of the Euler–Lagrange equation with soft-edge endpoint conditions '
  + '(Saff & Totik, Logarithmic Potentials with External Fields, 1997, ch. IV; Deift, Orthogonal Polynomials '
  + 'and Random Matrices, 1999, ch. 6; Mason & Handscomb, Chebyshev Polynomials, 2003)'

/** ∫_{−1}^{1} log|t − s| T_n(s)/√(1−s²) ds for n = 0 … out.length − 1. */
function logMoments(t: number, out: Float64Array): void {
  const M = out.length
  const at = Math.abs(t)
  if (at <= 1) {
    out[0] = -Math.PI * Math.LN2
    let tPrev = 1
    let tCur = t
    for (let n = 1; n < M; n++) {
      out[n] = -Math.PI * tCur / n
      const tNext = 2 * t * tCur - tPrev
      tPrev = tCur
      tCur = tNext
    }
  }
  else {
    const w = at + Math.sqrt((at - 1) * (at + 1))
    out[0] = Math.PI * Math.log(w / 2)
    const q = (t > 0 ? 1 : -1) / w
    let pw = q
    for (let n = 1; n < M; n++) {
      out[n] = -Math.PI * pw / n
      pw *= q
    }
  }
}

/** Solves A x = y in place (A row-major n×n) by Gaussian elimination with partial pivoting. */
function solveDense(A: Float64Array, y: Float64Array, n: number): Float64Array {
  for (let k = 0; k < n; k++) {
    let p = k
    let best = Math.abs(A[k * n + k])
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(A[i * n + k])
      if (v > best) {
        best = v
        p = i
      }
    }
    if (!(best > 0)) throw new RangeError('numerical line equilibrium: singular collocation system')
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const tmp = A[k * n + j]
        A[k * n + j] = A[p * n + j]
        A[p * n + j] = tmp
      }
      const tmp = y[k]
      y[k] = y[p]
      y[p] = tmp
    }
    const pivot = A[k * n + k]
    for (let i = k + 1; i < n; i++) {
      const f = A[i * n + k] / pivot
      if (f === 0) continue
      for (let j = k; j < n; j++) A[i * n + j] -= f * A[k * n + j]
      y[i] -= f * y[k]
    }
  }
  const x = new Float64Array(n)
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i]
    for (let j = i + 1; j < n; j++) s -= A[i * n + j] * x[j]
    x[i] = s / A[i * n + i]
  }
  return x
}

interface Solution {
  ends: number[] // a_0, b_0, a_1, b_1, …
  M: number
  mid: number[]
  half: number[]
  coef: Float64Array[] // per interval, M Chebyshev coefficients of the density numerator
  c: number
}

function layout(ends: number[]): { mid: number[], half: number[] } {
  const mid: number[] = []
  const half: number[] = []
  for (let j = 0; 2 * j < ends.length; j++) {
    mid.push((ends[2 * j] + ends[2 * j + 1]) / 2)
    half.push((ends[2 * j + 1] - ends[2 * j]) / 2)
  }
  return { mid, half }
}

function solveFixed(V: (x: number) => number, ends: number[], M: number): Solution {
  const { mid, half } = layout(ends)
  const J = mid.length
  const n = J * M + 1
  const A = new Float64Array(n * n)
  const rhs = new Float64Array(n)
  const L = new Float64Array(M)
  for (let k = 0; k < J; k++) {
    for (let i = 0; i < M; i++) {
      const row = k * M + i
      const x = mid[k] + half[k] * Math.cos(Math.PI * (i + 0.5) / M)
      for (let j = 0; j < J; j++) {
        logMoments((x - mid[j]) / half[j], L)
        const hj = half[j]
        A[row * n + j * M] = -hj * (Math.PI * Math.log(hj) + L[0])
        for (let m = 1; m < M; m++) A[row * n + j * M + m] = -hj * L[m]
      }
      A[row * n + n - 1] = -1
      rhs[row] = -V(x) / 2
    }
  }
  for (let j = 0; j < J; j++) A[(n - 1) * n + j * M] = Math.PI * half[j]
  rhs[n - 1] = 1
  const sol = solveDense(A, rhs, n)
  const coef: Float64Array[] = []
  for (let j = 0; j < J; j++) coef.push(sol.slice(j * M, (j + 1) * M))
  return { ends: ends.slice(), M, mid, half, coef, c: sol[n - 1] }
}

/** Density numerators at the endpoints: f_j(−1), f_j(+1) for every interval (zero for a bounded density). */
function edgeResidual(s: Solution): number[] {
  const r: number[] = []
  for (const c of s.coef) {
    let plus = 0
    let minus = 0
    for (let n = 0; n < c.length; n++) {
      plus += c[n]
      minus += n % 2 === 0 ? c[n] : -c[n]
    }
    r.push(minus, plus)
  }
  return r
}

const norm = (v: number[]): number => Math.sqrt(v.reduce((s, x) => s + x * x, 0))

function ordered(ends: number[], minWidth: number): boolean {
  for (let i = 0; i + 1 < ends.length; i++) {
    const gap = ends[i + 1] - ends[i]
    if (!(gap > (i % 2 === 0 ? minWidth : 0))) return false
  }
  return true
}

/** Newton's method on the endpoints; returns undefined when it does not converge. */
function newtonEndpoints(V: (x: number) => number, start: number[], M: number, scale: number): Solution | undefined {
  let ends = start.slice()
  const K = ends.length
  let current = solveFixed(V, ends, M)
  let F = edgeResidual(current)
  const minWidth = 1e-9 * scale
  // at the rounding floor Newton's iterates wander; the best one seen is returned
  let best = current
  let bestNorm = norm(F)
  const keep = (s: Solution, n: number): void => {
    if (n < bestNorm) {
      best = s
      bestNorm = n
    }
  }
  for (let iter = 0; iter < 80; iter++) {
    const size = Math.max(...current.coef.map(c => Math.abs(c[0])))
    if (norm(F) < 1e-14 * size) return best
    // Jacobian by forward differences (its O(δ) error only slows Newton's final convergence slightly)
    const delta = 1e-7 * scale
    const Jac: number[][] = Array.from({ length: K }, () => new Array<number>(K).fill(0))
    for (let q = 0; q < K; q++) {
      const up = ends.slice()
      up[q] += delta
      const Fu = edgeResidual(solveFixed(V, up, M))
      for (let p = 0; p < K; p++) Jac[p][q] = (Fu[p] - F[p]) / delta
    }
    const Aflat = new Float64Array(K * K)
    for (let p = 0; p < K; p++) for (let q = 0; q < K; q++) Aflat[p * K + q] = Jac[p][q]
    let step: Float64Array
    try {
      step = solveDense(Aflat, Float64Array.from(F), K)
    }
    catch {
      return undefined
    }
    let lambda = 1
    let accepted = false
    for (let tries = 0; tries < 30; tries++) {
      const trial = ends.map((e, q) => e - lambda * step[q])
      if (ordered(trial, minWidth)) {
        const s = solveFixed(V, trial, M)
        const Ft = edgeResidual(s)
        if (norm(Ft) < (1 - 1e-4 * lambda) * norm(F) || (tries > 20 && norm(Ft) < norm(F))) {
          ends = trial
          current = s
          F = Ft
          keep(s, norm(Ft))
          accepted = true
          break
        }
      }
      lambda /= 2
    }
    if (!accepted) {
      const sizeNow = Math.max(...current.coef.map(c => Math.abs(c[0])))
      return bestNorm < 1e-10 * sizeNow ? best : undefined
    }
    const stepSize = Math.max(...Array.from(step, v => Math.abs(v))) * lambda
    if (stepSize < 1e-15 * scale) return best
  }
  const sizeEnd = Math.max(...best.coef.map(c => Math.abs(c[0])))
  return bestNorm < 1e-10 * sizeEnd ? best : undefined
}

/** Chebyshev coefficients of f on [a, b] from n first-kind points (used to pick the degree). */
function chebCoefficients(f: (x: number) => number, a: number, b: number, n: number): Float64Array {
  const vals = new Float64Array(n)
  for (let i = 0; i < n; i++) vals[i] = f((a + b) / 2 + (b - a) / 2 * Math.cos(Math.PI * (i + 0.5) / n))
  const c = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    let s = 0
    for (let i = 0; i < n; i++) s += vals[i] * Math.cos(Math.PI * k * (i + 0.5) / n)
    c[k] = (k === 0 ? 1 : 2) * s / n
  }
  return c
}

function pickDegree(V: (x: number) => number, ends: number[], maxDegree: number): number {
  let M = 16
  for (; M < maxDegree; M *= 2) {
    let ok = true
    for (let j = 0; 2 * j < ends.length && ok; j++) {
      const c = chebCoefficients(V, ends[2 * j], ends[2 * j + 1], M)
      const big = Math.max(...Array.from(c, Math.abs))
      const tail = Math.max(Math.abs(c[M - 1]), Math.abs(c[M - 2]), Math.abs(c[M - 3]))
      if (tail > 1e-15 * Math.max(big, 1)) ok = false
    }
    if (ok) break
  }
  return Math.min(M, maxDegree)
}

/** Σ_n e_n U_n(t) (Chebyshev polynomials of the second kind) by Clenshaw's recurrence. */
function chebUSum(e: Float64Array, t: number): number {
  let b1 = 0
  let b2 = 0
  for (let n = e.length - 1; n >= 0; n--) {
    const b0 = e[n] + 2 * t * b1 - b2
    b2 = b1
    b1 = b0
  }
  return b1
}

/**
 * For f = Σ c_n T_n vanishing at ±1, the coefficients e of f = (1 − t²) Σ e_n U_n, from
 * (1 − t²) U_n = (T_n − T_{n+2})/2: e_n = e_{n+2} − 2 c_{n+2}, downwards from e_{M−1} = e_{M−2} = 0.
 * The density is then √(1 − t²) Σ e_n U_n(t): bounded and free of cancellation at the edges.
 */
function secondKindCoefficients(c: Float64Array): Float64Array {
  const M = c.length
  const e = new Float64Array(Math.max(M - 2, 1))
  for (let n = M - 3; n >= 0; n--) e[n] = (n + 2 < M - 2 ? e[n + 2] : 0) - 2 * c[n + 2]
  return e
}

interface Evaluators {
  potential(x: number): number
  /** Density divided by √(1 − t²) on interval j, i.e. Σ e_n U_n(t). */
  reduced(j: number, t: number): number
}

function evaluators(s: Solution): Evaluators {
  const L = new Float64Array(s.M)
  const second = s.coef.map(secondKindCoefficients)
  return {
    potential(x: number): number {
      let h = 0
      for (let j = 0; j < s.coef.length; j++) {
        logMoments((x - s.mid[j]) / s.half[j], L)
        const c = s.coef[j]
        let acc = c[0] * (Math.PI * Math.log(s.half[j]) + L[0])
        for (let n = 1; n < s.M; n++) acc += c[n] * L[n]
        h -= s.half[j] * acc
      }
      return h
    },
    reduced(j: number, t: number): number {
      return chebUSum(second[j], t)
    },
  }
}

interface Check {
  ok: boolean
  negativeAt?: { interval: number, from: number, to: number }
  zetaNegativeAt?: number
  residual: number
}

function check(s: Solution, V: (x: number) => number, box: [number, number], rhoTol = 1e-8, zetaTol = 1e-9): Check {
  const ev = evaluators(s)
  let residual = 0
  let worstNeg: Check['negativeAt']
  let maxRho = 0
  const probes = 400
  for (let j = 0; j < s.coef.length; j++) {
    let from = Infinity
    let to = -Infinity
    for (let k = 1; k < probes; k++) {
      const t = -Math.cos(Math.PI * k / probes)
      const x = s.mid[j] + s.half[j] * t
      const rho = ev.reduced(j, t) * Math.sqrt(1 - t * t)
      maxRho = Math.max(maxRho, rho)
      if (rho < 0) {
        from = Math.min(from, x)
        to = Math.max(to, x)
      }
      residual = Math.max(residual, Math.abs(ev.potential(x) + V(x) / 2 - s.c))
    }
    if (from <= to) {
      let minRho = Infinity
      for (let k = 1; k < probes; k++) {
        const t = -Math.cos(Math.PI * k / probes)
        minRho = Math.min(minRho, ev.reduced(j, t) * Math.sqrt(1 - t * t))
      }
      if (minRho < -rhoTol * Math.max(1, maxRho) && worstNeg === undefined) worstNeg = { interval: j, from, to }
    }
  }
  let zetaMin = 0
  let zetaAt: number | undefined
  const grid = 4000
  for (let k = 0; k <= grid; k++) {
    const x = box[0] + (box[1] - box[0]) * k / grid
    let inside = false
    for (let j = 0; j < s.coef.length; j++) if (x >= s.ends[2 * j] && x <= s.ends[2 * j + 1]) inside = true
    if (inside) continue
    const z = ev.potential(x) + V(x) / 2 - s.c
    if (z < zetaMin) {
      zetaMin = z
      zetaAt = x
    }
  }
  const zetaBad = zetaMin < -zetaTol * Math.max(1, Math.abs(s.c))
  return {
    ok: worstNeg === undefined && !zetaBad,
    negativeAt: worstNeg,
    zetaNegativeAt: zetaBad ? zetaAt : undefined,
    residual,
  }
}

function defaultBox(V: (x: number) => number): [number, number] {
  for (let R = 1; R <= 2 ** 30; R *= 2) {
    let vmin = Infinity
    for (let k = 0; k <= 2000; k++) vmin = Math.min(vmin, V(-R + 2 * R * k / 2000))
    const margin = 15 + Math.log(R)
    if (V(-R) / 2 - vmin / 2 > margin && V(R) / 2 - vmin / 2 > margin) return [-R, R]
  }
  throw new EngineInputError('the potential does not confine: V(x)/2 − log|x| does not grow on |x| ≤ 2^30')
}

/**
 * Endpoints of the sublevel sets {V ≤ min V + δ} on the box for δ = 2, 1, ½, ¼ (their connected pieces are
 * starting guesses for multi-well potentials), and the hull of the first (the one-cut guess).
 */
function sublevelGuess(V: (x: number) => number, box: [number, number]): { hull: number[], pieces: number[][] } {
  const n = 4000
  const xs: number[] = []
  const vs: number[] = []
  for (let k = 0; k <= n; k++) {
    const x = box[0] + (box[1] - box[0]) * k / n
    xs.push(x)
    vs.push(V(x))
  }
  const vmin = Math.min(...vs)
  const all: number[][] = []
  for (const delta of [2, 1, 0.5, 0.25]) {
    const level = vmin + delta
    const pieces: number[] = []
    let open = false
    for (let k = 0; k <= n; k++) {
      const inside = vs[k] <= level
      if (inside && !open) {
        pieces.push(xs[Math.max(0, k - 1)])
        open = true
      }
      if (!inside && open) {
        pieces.push(xs[k])
        open = false
      }
    }
    if (open) pieces.push(xs[n])
    all.push(pieces)
  }
  const first = all[0]
  return { hull: [first[0], first[first.length - 1]], pieces: all }
}

function normaliseEnds(ends: number[], minWidth: number): number[] {
  // drop collapsed intervals and merge overlapping ones
  const out: number[] = []
  for (let j = 0; 2 * j < ends.length; j++) {
    const a = ends[2 * j]
    const b = ends[2 * j + 1]
    if (b - a < minWidth) continue
    if (out.length > 0 && a <= out[out.length - 1]) out[out.length - 1] = Math.max(out[out.length - 1], b)
    else out.push(a, b)
  }
  return out
}

/**
 * The equilibrium measure of g = −log|x| on R for the potential V (d = 1), as an EquilibriumMeasure with
 * method 'numerical'. Handles supports of one or several intervals (e.g. double wells).
 */
export function solveLineEquilibrium(potential: Potential, options: LineSolverOptions = {}): LineEquilibriumMeasure {
  if (potential.d !== 1) throw new EngineInputError(`the line solver needs a potential on R (d = 1), got d = ${potential.d}`)
  const V = (x: number): number => potential.value([x], 0)
  const box = options.box ?? defaultBox(V)
  if (!(box[0] < box[1])) throw new EngineInputError(`the box [${box[0]}, ${box[1]}] must have L < R`)
  const tolerance = options.tolerance ?? 1e-11
  const maxDegree = options.maxDegree ?? 256
  const maxIntervals = options.maxIntervals ?? 4
  const guess = sublevelGuess(V, box)
  const scale = guess.hull[1] - guess.hull[0]
  const candidates: number[][] = [guess.hull]
  for (const p of guess.pieces) if (p.length > 2 && p.length / 2 <= maxIntervals) candidates.push(p)
  const tried = new Set<string>()
  let last: { s: Solution, chk: Check } | undefined
  const Mwork = 24
  while (candidates.length > 0) {
    const start = normaliseEnds(candidates.shift() as number[], 1e-6 * scale)
    const key = start.map(e => e.toPrecision(6)).join(',')
    if (start.length === 0 || tried.has(key) || start.length / 2 > maxIntervals) continue
    tried.add(key)
    const coarse = newtonEndpoints(V, start, Mwork, scale)
    if (coarse === undefined) continue
    const ends = normaliseEnds(coarse.ends, 1e-6 * scale)
    if (ends.length !== coarse.ends.length) {
      candidates.unshift(ends)
      continue
    }
    // a clearly inadmissible coarse solution is restructured at once; admissible ones are refined
    let s = coarse
    let chk = check(coarse, V, box, 1e-3, Infinity)
    if (chk.ok) {
      let M = pickDegree(V, ends, maxDegree)
      const fine = newtonEndpoints(V, ends, M, scale)
      if (fine === undefined) continue
      s = fine
      // Double the degree until the endpoints stop moving and the Euler–Lagrange residual meets the target;
      // the last shift of the endpoints enters the accuracy estimate.
      let shift = Infinity
      chk = check(s, V, box)
      // the dense collocation system has J·M unknowns: keep it at most 512 (a few hundred ms per solve)
      const cap = Math.max(16, Math.min(maxDegree, Math.floor(512 / (ends.length / 2))))
      while (M < cap) {
        M = Math.min(2 * M, cap)
        const refined = newtonEndpoints(V, s.ends, M, scale)
        if (refined === undefined) break
        shift = Math.max(...refined.ends.map((e, q) => Math.abs(e - s.ends[q])))
        s = refined
        chk = check(s, V, box)
        if (shift <= tolerance * scale && chk.residual <= tolerance) break
      }
      if (chk.ok) return build(potential, s, chk, Number.isFinite(shift) ? shift : 0)
    }
    last = { s, chk }
    if (chk.negativeAt !== undefined && s.ends.length / 2 < maxIntervals) {
      const { interval, from, to } = chk.negativeAt
      const split = s.ends.slice()
      split.splice(2 * interval + 1, 0, from, to)
      candidates.unshift(split)
    }
    else if (chk.zetaNegativeAt !== undefined && s.ends.length / 2 < maxIntervals) {
      const x0 = chk.zetaNegativeAt
      const w = 0.02 * scale
      const added = [...s.ends, x0 - w, x0 + w]
      const pairs: Array<[number, number]> = []
      for (let j = 0; 2 * j < added.length; j++) pairs.push([added[2 * j], added[2 * j + 1]])
      pairs.sort((p, q) => p[0] - q[0])
      candidates.unshift(pairs.flat())
    }
  }
  if (last !== undefined) {
    throw new EngineInputError(`the line equilibrium solver found no admissible support (last try: ${last.s.ends.length / 2} interval(s), `
      + `${last.chk.negativeAt ? 'negative density' : 'ζ < 0 outside the support'}); try a larger maxIntervals or a box`)
  }
  throw new EngineInputError('the line equilibrium solver did not converge for this potential; try giving a box around the support')
}

function build(potential: Potential, s: Solution, chk: Check, endpointShift: number): LineEquilibriumMeasure {
  const ev = evaluators(s)
  const V = (x: number): number => potential.value([x], 0)
  const J = s.coef.length
  const K = Math.max(2 * s.M, 64)
  const rule = gaussChebyshevFirst(K)
  let selfEnergy = 0
  let vMass = 0
  const intervalMasses: number[] = []
  for (let j = 0; j < J; j++) {
    intervalMasses.push(Math.PI * s.half[j] * s.coef[j][0])
    for (let k = 0; k < K; k++) {
      const t = rule.nodes[k]
      const x = s.mid[j] + s.half[j] * t
      const wf = rule.weights[k] * s.half[j] * (1 - t * t) * ev.reduced(j, t)
      selfEnergy += wf * ev.potential(x)
      vMass += wf * V(x)
    }
  }
  const cV = selfEnergy + vMass / 2
  // measured: Euler–Lagrange residual off the collocation points, the two ways of getting c_V, and the
  // last change of the endpoints when the degree was doubled (times the typical slope of h^μ + V/2)
  const accuracy = Math.max(chk.residual, Math.abs(cV - s.c), endpointShift, 1e-15 * Math.abs(cV))
  const intervals: Array<[number, number]> = []
  for (let j = 0; j < J; j++) intervals.push([s.ends[2 * j], s.ends[2 * j + 1]])
  const hmu = (x: number): number => ev.potential(x)
  const at = (points: ArrayLike<number>, offset: number): number => {
    const x = points[offset]
    if (!Number.isFinite(x)) throw new EngineInputError(`the point at offset ${offset} is not a finite number`, { index: offset })
    return x
  }
  return {
    d: 1,
    kernel: { name: 'log' },
    support: { kind: 'intervals', intervals },
    method: 'numerical',
    accuracy,
    source: SOURCE,
    selfEnergy,
    IV: selfEnergy + vMass,
    cV,
    engineVersion: ENGINE_VERSION,
    intervalMasses,
    degree: s.M,
    density(points, offset = 0) {
      const x = at(points, offset)
      for (let j = 0; j < J; j++) {
        if (x > s.ends[2 * j] && x < s.ends[2 * j + 1]) {
          const t = (x - s.mid[j]) / s.half[j]
          if (Math.abs(t) >= 1) return 0
          return Math.max(0, ev.reduced(j, t) * Math.sqrt((1 - t) * (1 + t)))
        }
      }
      return 0
    },
    potential(points, offset = 0) {
      return hmu(at(points, offset))
    },
    sphereAverage(points, offset, eta) {
      const x = at(points, offset)
      if (!(eta >= 0)) throw new EngineInputError(`the radius η must be ≥ 0 (got ${eta})`, { index: offset })
      return (hmu(x - eta) + hmu(x + eta)) / 2
    },
    zeta(points, offset = 0) {
      const x = at(points, offset)
      let inside = false
      for (let j = 0; j < J; j++) if (x >= s.ends[2 * j] && x <= s.ends[2 * j + 1]) inside = true
      if (inside) return 0
      return hmu(x) + V(x) / 2 - cV
    },
  }
}
