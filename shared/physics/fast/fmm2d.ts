// Fast multipole method for the 2-D logarithmic kernel g(x) = −log|x| (Greengard & Rokhlin, "A fast
// algorithm for particle simulations", J. Comput. Phys. 73, 1987, §2; Greengard, The Rapid Evaluation
// of Potential Fields in Particle Systems, MIT Press, 1988). With z = x + iy and Φ(z) = Σ_j log(z − z_j)
// the potential is φ = −Re Φ and the force −∇φ = (Re Φ′, −Im Φ′). Expansions (scaled by the cube's
// half-width R, w = (z − c)/R):
//   multipole  Φ(z) ≈ a₀ log(z − c) + Σ_{k=1}^{p} ã_k (R/(z − c))^k,  a₀ = n,  ã_k = −Σ_j w_j^k / k
//   local      Φ(z) ≈ Σ_{l=0}^{p} b̃_l w^l
//   M2M, M2L, L2L: Lemmas 2.3, 2.4 and 2.5 of Greengard & Rokhlin (1987), rewritten for scaled
//   coefficients; L2L by repeated synthetic division (Horner shift).
// Error bound (derived as in Lemma 2.1 there): for a far pair of nodes with radii r_A, r_B about their
// centres and distance D = |c_A − c_B|, the p-term M2L gives every point pair an error at most
//   ε(θ, p) = Σ_{n>p} θ^n / n ≤ θ^{p+1} / ((p + 1)(1 − θ)),   θ = (r_A + r_B)/D,
// i.e. (1/((p + 1)(c − 1)))·c^(−p) with separation ratio c = 1/θ, the Greengard–Rokhlin form.
// Energies need no local expansions: the energy of a far pair of nodes is the series of log(z₀ + s),
// s = w_i − w_j, truncated at total degree q in the two nodes' moments (farPairLog), with the same
// per-pair bound ε(θ, q). Each far pair gets its own order q_AB, the smallest with
// n_A n_B θ^(q+1)/((q + 1)(1 − θ)) ≤ n_A n_B·τ, τ = tolerance·L/(2 Σ n_A n_B), L a lower bound of |E|
// (the exact near field and every far pair at order 4, less that order's bound); the reported bound
// is Σ n_A n_B θ^(q+1)/((q + 1)(1 − θ)) over the orders used. Forces: per point pair the error is at most (1/D) Σ_{n>p} θ^(n−1), so
// relative to Σ_j 1/|x_i − x_j| it is at most (1 + θ) θ^p / (1 − θ).
import { EngineInputError } from '../errors'
import { CompensatedSum } from '../summation'
import { ENGINE_VERSION } from '../version'
import type { InteractionLists, PointTree } from './quadtree'
import { buildTree, interactionLists } from './quadtree'
import { PairKernels, wasmSimdAvailable } from './wasm'

export interface FmmOptions {
  /** Requested relative error of the energy (default 1e−10). */
  readonly tolerance?: number
  /** Fixed expansion order p (overrides the tolerance). */
  readonly order?: number
  /** At most this many points per leaf (default 128). */
  readonly leafSize?: number
  /** Opening parameter θ in (0, 1): far when (r_A + r_B) ≤ θ·D (default 0.6). */
  readonly theta?: number
}

export interface FmmParameters {
  /** The largest expansion order used. */
  readonly order: number
  /** The mean order over the far pairs of nodes expanded (energies: each pair has its own). */
  readonly meanOrder?: number
  readonly leafSize: number
  readonly theta: number
  readonly nodes: number
  readonly farPairs: number
  readonly nearPairs: number
}

export interface FmmEnergyResult {
  /** Σ_{i<j} −log|x_i − x_j|. */
  readonly value: number
  /** Rigorous bound of |value − exact| from the truncation (rounding not included). */
  readonly absoluteErrorBound: number
  /** absoluteErrorBound / |value|. */
  readonly errorBound: number
  readonly parameters: FmmParameters
  readonly engineVersion: string
}

export interface FmmFieldsResult {
  /** φ_i = Σ_{j≠i} −log|x_i − x_j|. */
  readonly potential: Float64Array
  /** F_i = Σ_{j≠i} (x_i − x_j)/|x_i − x_j|², two numbers per point. */
  readonly force: Float64Array
  /** Bound of the error of φ_i per far point pair, ε(θ, p). */
  readonly pairErrorBound: number
  /** Bound of the force error relative to Σ_j 1/|x_i − x_j|. */
  readonly forceErrorBound: number
  readonly parameters: FmmParameters
  readonly engineVersion: string
}

const MAX_ORDER = 60

/** ε(θ, p) = Σ_{n>p} θ^n / n, the per-pair truncation bound. */
export function logTail(theta: number, p: number): number {
  let term = Math.pow(theta, p + 1)
  let s = 0
  for (let n = p + 1; n < p + 2000 && term > 1e-40 * s; n++) {
    s += term / n
    term *= theta
  }
  return s
}

function checkOptions(points: Float64Array, options: FmmOptions): { tol: number, leaf: number, theta: number } {
  if (points.length % 2 !== 0) throw new EngineInputError(`the coordinate array has ${points.length} numbers, not a multiple of 2`)
  for (let k = 0; k < points.length; k++) {
    if (!Number.isFinite(points[k])) throw new EngineInputError(`point ${Math.floor(k / 2)} has a coordinate that is not a finite number (${points[k]})`, { index: Math.floor(k / 2) })
  }
  const tol = options.tolerance ?? 1e-10
  const leaf = options.leafSize ?? 128
  const theta = options.theta ?? 0.6
  if (!(tol > 0 && tol < 1)) throw new EngineInputError(`the tolerance must be in (0, 1) (got ${tol})`)
  if (!(theta > 0 && theta < 1)) throw new EngineInputError(`the opening parameter θ must be in (0, 1) (got ${theta})`)
  if (options.order !== undefined && !(Number.isInteger(options.order) && options.order >= 1 && options.order <= MAX_ORDER)) {
    throw new EngineInputError(`the expansion order must be an integer in [1, ${MAX_ORDER}] (got ${options.order})`)
  }
  return { tol, leaf, theta }
}

/** Binomial table C[n][k] for n ≤ 2p. */
function binomials(p: number): Float64Array[] {
  const rows: Float64Array[] = []
  for (let n = 0; n <= 2 * p + 1; n++) {
    const r = new Float64Array(n + 1)
    r[0] = 1
    r[n] = 1
    for (let k = 1; k < n; k++) r[k] = rows[n - 1][k - 1] + rows[n - 1][k]
    rows.push(r)
  }
  return rows
}

function coincident(tree: PointTree, a: number, b: number): never {
  const i = Math.min(tree.perm[a], tree.perm[b])
  const j = Math.max(tree.perm[a], tree.perm[b])
  throw new EngineInputError(`points ${i} and ${j} coincide; the interaction energy is infinite`, { indices: [i, j] })
}

/** Σ log|x_i − x_j|² over the leaf pairs (a, b), by products of squared distances (one logarithm per
 *  product leaving [1e−150, 1e150]); with the SIMD kernels when they can be used. */
function nearLogSum(tree: PointTree, A: number[], B: number[], kernels: PairKernels | undefined): number {
  const P = tree.sorted
  const total = new CompensatedSum()
  if (kernels) {
    for (let q = 0; q < A.length; q++) {
      const a = A[q]
      const b = B[q]
      const v = kernels.blockLog2(tree.start[a], tree.end[a], tree.start[b], tree.end[b])
      if (Number.isNaN(v)) {
        const pair = kernels.coincidence()
        if (pair) coincident(tree, pair[0], pair[1])
      }
      total.add(v)
    }
    return total.value
  }
  for (let q = 0; q < A.length; q++) {
    const a = A[q]
    const b = B[q]
    const logs = new CompensatedSum()
    let prod = 1
    for (let i = tree.start[a]; i < tree.end[a]; i++) {
      const xi = P[2 * i]
      const yi = P[2 * i + 1]
      for (let j = a === b ? i + 1 : tree.start[b]; j < tree.end[b]; j++) {
        const dx = xi - P[2 * j]
        const dy = yi - P[2 * j + 1]
        const r2 = dx * dx + dy * dy
        if (r2 < 1e-150 || r2 > 1e150) {
          if (r2 === 0) coincident(tree, i, j)
          logs.add(Math.log(r2))
          continue
        }
        prod *= r2
        if (prod < 1e-150 || prod > 1e150) {
          logs.add(Math.log(prod))
          prod = 1
        }
      }
    }
    if (prod !== 1) logs.add(Math.log(prod))
    total.addSum(logs)
  }
  return total.value
}

/** The SIMD kernels holding the sorted points, or undefined (no WebAssembly, or huge coordinates). */
function nearKernels(tree: PointTree): PairKernels | undefined {
  let m = 0
  for (let k = 0; k < tree.sorted.length; k++) m = Math.max(m, Math.abs(tree.sorted[k]))
  if (!(m < 1e34) || !wasmSimdAvailable()) return undefined
  const kernels = new PairKernels()
  kernels.load(tree.sorted, 2)
  return kernels
}

/** Multipole coefficients of every node, p + 1 slots: ã_k = −σ_k/k (k = 1..p) and n in slot 0. */
function upwardPass(tree: PointTree, p: number, C: Float64Array[]): { re: Float64Array, im: Float64Array } {
  const { sr, si } = momentPass(tree, p, C)
  for (let o = 0; o < sr.length; o += p + 1) {
    for (let k = 1; k <= p; k++) {
      sr[o + k] /= -k
      si[o + k] /= -k
    }
  }
  return { re: sr, im: si }
}

/** Node moments σ_X[k] = Σ_{j∈X} ((z_j − c_X)/R_X)^k, k = 0..p (σ[0] = n_X), p + 1 slots per node:
 *  at the leaves from the points, above by the binomial shift
 *  σ_P[n] = Σ_{k≤n} C(n, k) ρ^k σ_c[k] t^(n−k), t = (c_c − c_P)/R_P, ρ = R_c/R_P. */
function momentPass(tree: PointTree, p: number, C: Float64Array[]): { sr: Float64Array, si: Float64Array } {
  const M = tree.start.length
  const sr = new Float64Array(M * (p + 1))
  const si = new Float64Array(M * (p + 1))
  const P = tree.sorted
  const tp = new Float64Array(2 * (p + 1))
  const cr = new Float64Array(p + 1)
  const ci = new Float64Array(p + 1)
  for (let node = M - 1; node >= 0; node--) {
    const o = node * (p + 1)
    const cx = tree.centre[2 * node]
    const cy = tree.centre[2 * node + 1]
    const inv = 1 / tree.half[node]
    sr[o] = tree.end[node] - tree.start[node]
    const ch = tree.children[node]
    if (ch.length === 0) {
      for (let j = tree.start[node]; j < tree.end[node]; j++) {
        const wx = (P[2 * j] - cx) * inv
        const wy = (P[2 * j + 1] - cy) * inv
        let tr = 1
        let ti = 0
        for (let k = 1; k <= p; k++) {
          const nr = tr * wx - ti * wy
          ti = tr * wy + ti * wx
          tr = nr
          sr[o + k] += tr
          si[o + k] += ti
        }
      }
      continue
    }
    for (const c of ch) {
      const oc = c * (p + 1)
      const tx = (tree.centre[2 * c] - cx) * inv
      const ty = (tree.centre[2 * c + 1] - cy) * inv
      const rho = tree.half[c] * inv
      tp[0] = 1
      tp[1] = 0
      for (let l = 1; l <= p; l++) {
        tp[2 * l] = tp[2 * l - 2] * tx - tp[2 * l - 1] * ty
        tp[2 * l + 1] = tp[2 * l - 2] * ty + tp[2 * l - 1] * tx
      }
      let rk = 1
      for (let k = 0; k <= p; k++) {
        cr[k] = sr[oc + k] * rk
        ci[k] = si[oc + k] * rk
        rk *= rho
      }
      for (let n = 1; n <= p; n++) {
        const Cn = C[n]
        let ar = 0
        let ai = 0
        for (let k = 0; k <= n; k++) {
          const b = Cn[k]
          const xr = tp[2 * (n - k)]
          const xi = tp[2 * (n - k) + 1]
          ar += b * (cr[k] * xr - ci[k] * xi)
          ai += b * (cr[k] * xi + ci[k] * xr)
        }
        sr[o + n] += ar
        si[o + n] += ai
      }
    }
  }
  return { sr, si }
}

/** M2L from node a into node b: adds b̃_l (l = 0..p) to the local arrays at offset ob. */
function m2l(tree: PointTree, p: number, T: Float64Array, mre: Float64Array, mim: Float64Array, a: number, b: number, out: Float64Array, scratch: Float64Array): void {
  const oa = a * (p + 1)
  const zx = tree.centre[2 * a] - tree.centre[2 * b]
  const zy = tree.centre[2 * a + 1] - tree.centre[2 * b + 1]
  const z2 = zx * zx + zy * zy
  // u = −R_a/z0, v = R_b/z0
  const ia = tree.half[a] / z2
  const ur = -ia * zx
  const ui = ia * zy
  const ib = tree.half[b] / z2
  const vr = ib * zx
  const vi = -ib * zy
  // α_k = ã_k u^k
  let pr = 1
  let pi = 0
  let s0r = 0.5 * Math.log(z2) * mre[oa]
  let s0i = Math.atan2(-zy, -zx) * mre[oa]
  for (let k = 1; k <= p; k++) {
    const nr = pr * ur - pi * ui
    pi = pr * ui + pi * ur
    pr = nr
    const ar = mre[oa + k] * pr - mim[oa + k] * pi
    const ai = mre[oa + k] * pi + mim[oa + k] * pr
    scratch[2 * k] = ar
    scratch[2 * k + 1] = ai
    s0r += ar
    s0i += ai
  }
  out[0] += s0r
  out[1] += s0i
  const a0 = mre[oa]
  let qr = 1
  let qi = 0
  for (let l = 1; l <= p; l++) {
    const nr = qr * vr - qi * vi
    qi = qr * vi + qi * vr
    qr = nr
    let sr = -a0 / l
    let si = 0
    const row = l * (p + 1)
    for (let k = 1; k <= p; k++) {
      const c = T[row + k]
      sr += c * scratch[2 * k]
      si += c * scratch[2 * k + 1]
    }
    out[2 * l] += sr * qr - si * qi
    out[2 * l + 1] += sr * qi + si * qr
  }
}

/** T[l(p + 1) + k] = C(l + k − 1, k − 1), the fixed M2L matrix of the scaled coefficients. */
function m2lTable(p: number, C: Float64Array[]): Float64Array {
  const T = new Float64Array((p + 1) * (p + 1))
  for (let l = 1; l <= p; l++) {
    for (let k = 1; k <= p; k++) T[l * (p + 1) + k] = C[l + k - 1][k - 1]
  }
  return T
}

interface Prepared {
  tree: PointTree
  lists: InteractionLists
  leaf: number
  theta: number
}

function prepare(points: Float64Array, options: FmmOptions): Prepared & { tol: number } {
  const { tol, leaf, theta } = checkOptions(points, options)
  const tree = buildTree(points, 2, leaf)
  const lists = interactionLists(tree, theta)
  return { tree, lists, leaf, theta, tol }
}

/** W[k(p + 1) + m] = (−1)^(k+m+1) C(k + m, k)/(k + m) for 1 ≤ k + m ≤ p: the coefficients of the
 *  far-pair energy in the moments of the two nodes (see farPairLog). */
function energyTable(p: number, C: Float64Array[]): Float64Array {
  const W = new Float64Array((p + 1) * (p + 1))
  for (let k = 0; k <= p; k++) {
    for (let m = 0; k + m <= p; m++) {
      const n = k + m
      if (n === 0) continue
      W[k * (p + 1) + m] = ((n % 2 === 1 ? 1 : -1) * C[n][k]) / n
    }
  }
  return W
}

/** Σ_{i∈b, j∈a} log(z_i − z_j) (real part), truncated at total degree q in s = w_i − w_j:
 *  log(z₀ + s) = log z₀ + Σ_{n=1}^{q} (−1)^(n+1) (s/z₀)^n / n, z₀ = c_b − c_a, and
 *  (s/z₀)^n = Σ_k C(n, k) (w_i/z₀)^k (−w_j/z₀)^(n−k), so with the node moments σ_X[k] = Σ (w/R_X)^k
 *  the pair of nodes costs (q + 1)(q + 2)/2 real products of β_k = σ_b[k](R_b/z₀)^k and
 *  α_m = σ_a[m](−R_a/z₀)^m. Every point pair has |s/z₀| ≤ (r_a + r_b)/D = θ, so the truncation error
 *  is at most n_a n_b Σ_{n>q} θ^n/n (Greengard & Rokhlin 1987, Lemma 2.1, for the total degree). */
function farPairLog(tree: PointTree, p: number, q: number, W: Float64Array, sr: Float64Array, si: Float64Array, a: number, b: number, br: Float64Array, bi: Float64Array, ar: Float64Array, ai: Float64Array): number {
  const zx = tree.centre[2 * b] - tree.centre[2 * a]
  const zy = tree.centre[2 * b + 1] - tree.centre[2 * a + 1]
  const z2 = zx * zx + zy * zy
  // t_b = R_b/z₀ and t_a = −R_a/z₀ (1/z₀ = conj(z₀)/|z₀|²)
  const tbr = (tree.half[b] * zx) / z2
  const tbi = (-tree.half[b] * zy) / z2
  const tar = (-tree.half[a] * zx) / z2
  const tai = (tree.half[a] * zy) / z2
  const oa = a * (p + 1)
  const ob = b * (p + 1)
  let ur = 1
  let ui = 0
  let vr = 1
  let vi = 0
  for (let k = 0; k <= q; k++) {
    br[k] = sr[ob + k] * ur - si[ob + k] * ui
    bi[k] = sr[ob + k] * ui + si[ob + k] * ur
    ar[k] = sr[oa + k] * vr - si[oa + k] * vi
    ai[k] = sr[oa + k] * vi + si[oa + k] * vr
    const nur = ur * tbr - ui * tbi
    ui = ur * tbi + ui * tbr
    ur = nur
    const nvr = vr * tar - vi * tai
    vi = vr * tai + vi * tar
    vr = nvr
  }
  let e = 0.5 * Math.log(z2) * sr[oa] * sr[ob]
  for (let k = 0; k <= q; k++) {
    const row = k * (p + 1)
    let gr = 0
    let gi = 0
    for (let m = k === 0 ? 1 : 0; k + m <= q; m++) {
      const w = W[row + m]
      gr += w * ar[m]
      gi += w * ai[m]
    }
    e += br[k] * gr - bi[k] * gi
  }
  return e
}

/** The smallest q ≥ 1 with θ^(q+1)/((q + 1)(1 − θ)) ≤ tau (≥ Σ_{n>q} θ^n/n), at most maxOrder. */
function orderFor(theta: number, tau: number, maxOrder: number): number {
  let t = (theta * theta) / (1 - theta)
  for (let q = 1; q < maxOrder; q++) {
    if (t / (q + 1) <= tau) return q
    t *= theta
  }
  return maxOrder
}

/** The energy Σ_{i<j} −log|x_i − x_j| of points in the plane (flat x0, y0, x1, y1, …). Every far
 *  pair of nodes gets its own order q_AB, the smallest whose bound n_A n_B θ^(q+1)/((q + 1)(1 − θ))
 *  is at most its share (by weight n_A n_B) of half the requested absolute error; the reported bound
 *  is the sum of these bounds for the orders used. */
export function fmm2dEnergy(points: Float64Array, options: FmmOptions = {}): FmmEnergyResult {
  const { tree, lists, leaf, theta, tol } = prepare(points, options)
  const kernels = nearKernels(tree)
  const near = -0.5 * nearLogSum(tree, lists.nearA, lists.nearB, kernels)
  const F = lists.farA.length
  const weight = new Float64Array(F)
  let totalWeight = 0
  for (let q = 0; q < F; q++) {
    const a = lists.farA[q]
    const b = lists.farB[q]
    weight[q] = (tree.end[a] - tree.start[a]) * (tree.end[b] - tree.start[b])
    totalWeight += weight[q]
  }
  const orders = new Int32Array(F)
  if (options.order !== undefined) {
    orders.fill(options.order)
  }
  else {
    // lower bound of |E|: the exact near field and every far pair at order 4, less its bound
    const q0 = 4
    const C0 = binomials(q0)
    const W0 = energyTable(q0, C0)
    const m0 = momentPass(tree, q0, C0)
    const scratch0 = [0, 1, 2, 3].map(() => new Float64Array(q0 + 1))
    const low = new CompensatedSum().add(near)
    const lowError = new CompensatedSum()
    for (let q = 0; q < F; q++) {
      low.add(-farPairLog(tree, q0, q0, W0, m0.sr, m0.si, lists.farA[q], lists.farB[q], scratch0[0], scratch0[1], scratch0[2], scratch0[3]))
      const th = lists.farRatio[q]
      lowError.add((weight[q] * Math.pow(th, q0 + 1)) / ((q0 + 1) * (1 - th)))
    }
    const L = Math.abs(low.value) - lowError.value
    const tau = L > 0 ? (0.5 * tol * L) / totalWeight : 0
    for (let q = 0; q < F; q++) orders[q] = tau > 0 ? orderFor(lists.farRatio[q], tau, MAX_ORDER) : MAX_ORDER
  }
  // far pairs with few points (n_A n_B ≤ q²) are summed directly: exact and cheaper than the expansion
  const dA: number[] = []
  const dB: number[] = []
  const mPairs: number[] = []
  let p = 1
  const absAcc = new CompensatedSum()
  for (let q = 0; q < F; q++) {
    const o = orders[q]
    if (weight[q] <= o * o) {
      dA.push(lists.farA[q])
      dB.push(lists.farB[q])
      continue
    }
    mPairs.push(q)
    if (o > p) p = o
    const th = lists.farRatio[q]
    absAcc.add((weight[q] * Math.pow(th, o + 1)) / ((o + 1) * (1 - th)))
  }
  const direct = -0.5 * nearLogSum(tree, dA, dB, kernels)
  const C = binomials(p)
  const W = energyTable(p, C)
  const { sr, si } = momentPass(tree, p, C)
  const br = new Float64Array(p + 1)
  const bi = new Float64Array(p + 1)
  const ar = new Float64Array(p + 1)
  const ai = new Float64Array(p + 1)
  const far = new CompensatedSum()
  let orderSum = 0
  for (const q of mPairs) {
    far.add(-farPairLog(tree, p, orders[q], W, sr, si, lists.farA[q], lists.farB[q], br, bi, ar, ai))
    orderSum += orders[q]
  }
  const value = far.add(near).add(direct).value
  const abs = absAcc.value
  return {
    value,
    absoluteErrorBound: abs,
    errorBound: value === 0 ? Infinity : abs / Math.abs(value),
    parameters: { order: p, meanOrder: mPairs.length ? orderSum / mPairs.length : 0, leafSize: leaf, theta, nodes: tree.start.length, farPairs: mPairs.length, nearPairs: lists.nearA.length + dA.length },
    engineVersion: ENGINE_VERSION,
  }
}

/** Potentials φ_i = Σ_{j≠i} −log|x_i − x_j| and forces F_i = −∇φ_i(x_i) in the plane. With a
 *  tolerance, p is the smallest order with ε(θ, p) ≤ tolerance and (1 + θ)θ^p/(1 − θ) ≤ tolerance. */
export function fmm2dFields(points: Float64Array, options: FmmOptions = {}): FmmFieldsResult {
  const { tree, lists, leaf, theta, tol } = prepare(points, options)
  let p = options.order ?? 0
  if (p === 0) {
    p = MAX_ORDER
    for (let k = 1; k <= MAX_ORDER; k++) {
      if (logTail(theta, k) <= tol && ((1 + theta) * Math.pow(theta, k)) / (1 - theta) <= tol) {
        p = k
        break
      }
    }
  }
  const N = points.length / 2
  const P = tree.sorted
  const M = tree.start.length
  const C = binomials(p)
  const T = m2lTable(p, C)
  const { re, im } = upwardPass(tree, p, C)
  const loc = new Float64Array(M * 2 * (p + 1))
  const out = new Float64Array(2 * (p + 1))
  const scratch = new Float64Array(2 * (p + 1))
  for (let q = 0; q < lists.farA.length; q++) {
    const a = lists.farA[q]
    const b = lists.farB[q]
    for (const [s, t] of [[a, b], [b, a]]) {
      out.fill(0)
      m2l(tree, p, T, re, im, s, t, out, scratch)
      const ot = t * 2 * (p + 1)
      for (let k = 0; k < 2 * (p + 1); k++) loc[ot + k] += out[k]
    }
  }
  // L2L, parents before children (node indices increase downwards)
  for (let node = 0; node < M; node++) {
    const o = node * 2 * (p + 1)
    for (const c of tree.children[node]) {
      const oc = c * 2 * (p + 1)
      const R = tree.half[node]
      const tx = (tree.centre[2 * c] - tree.centre[2 * node]) / R
      const ty = (tree.centre[2 * c + 1] - tree.centre[2 * node + 1]) / R
      for (let k = 0; k < 2 * (p + 1); k++) out[k] = loc[o + k]
      for (let j = 0; j < p; j++) {
        for (let k = p - 1; k >= j; k--) {
          const br = out[2 * (k + 1)]
          const bi = out[2 * (k + 1) + 1]
          out[2 * k] += tx * br - ty * bi
          out[2 * k + 1] += tx * bi + ty * br
        }
      }
      const rho = tree.half[c] / R
      let rk = 1
      for (let k = 0; k <= p; k++) {
        loc[oc + 2 * k] += out[2 * k] * rk
        loc[oc + 2 * k + 1] += out[2 * k + 1] * rk
        rk *= rho
      }
    }
  }
  const phi = new Float64Array(N)
  const fx = new Float64Array(N)
  const fy = new Float64Array(N)
  for (let node = 0; node < M; node++) {
    if (tree.children[node].length !== 0) continue
    const o = node * 2 * (p + 1)
    const R = tree.half[node]
    const cx = tree.centre[2 * node]
    const cy = tree.centre[2 * node + 1]
    for (let i = tree.start[node]; i < tree.end[node]; i++) {
      const wx = (P[2 * i] - cx) / R
      const wy = (P[2 * i + 1] - cy) / R
      // Horner for Φ and Φ′
      let vr = loc[o + 2 * p]
      let vi = loc[o + 2 * p + 1]
      let dr = 0
      let di = 0
      for (let k = p - 1; k >= 0; k--) {
        const ndr = dr * wx - di * wy + vr
        di = dr * wy + di * wx + vi
        dr = ndr
        const nvr = vr * wx - vi * wy + loc[o + 2 * k]
        vi = vr * wy + vi * wx + loc[o + 2 * k + 1]
        vr = nvr
      }
      phi[i] = -vr
      fx[i] = dr / R
      fy[i] = -di / R
    }
  }
  for (let q = 0; q < lists.nearA.length; q++) {
    const a = lists.nearA[q]
    const b = lists.nearB[q]
    for (let i = tree.start[a]; i < tree.end[a]; i++) {
      for (let j = a === b ? i + 1 : tree.start[b]; j < tree.end[b]; j++) {
        const dx = P[2 * i] - P[2 * j]
        const dy = P[2 * i + 1] - P[2 * j + 1]
        const r2 = dx * dx + dy * dy
        if (r2 === 0) coincident(tree, i, j)
        const g = -0.5 * Math.log(r2)
        phi[i] += g
        phi[j] += g
        fx[i] += dx / r2
        fy[i] += dy / r2
        fx[j] -= dx / r2
        fy[j] -= dy / r2
      }
    }
  }
  const potential = new Float64Array(N)
  const force = new Float64Array(2 * N)
  for (let m = 0; m < N; m++) {
    const i = tree.perm[m]
    potential[i] = phi[m]
    force[2 * i] = fx[m]
    force[2 * i + 1] = fy[m]
  }
  return {
    potential,
    force,
    pairErrorBound: logTail(theta, p),
    forceErrorBound: ((1 + theta) * Math.pow(theta, p)) / (1 - theta),
    parameters: { order: p, leafSize: leaf, theta, nodes: M, farPairs: lists.farA.length, nearPairs: lists.nearA.length },
    engineVersion: ENGINE_VERSION,
  }
}
