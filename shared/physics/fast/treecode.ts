// Tree code with Cartesian Taylor expansions for g(x) = |x|^(−s) (s > 0; coulomb s = 1 in R³) and
// g(x) = −log|x| in R³ and on the sphere S² (chordal distances), with points in R^d, d ≤ 3 (lower
// dimensions are embedded in R³). For a target x and an octree node A with centre c and radius r_A,
// accepted when r_A ≤ θ|X|, X = x − c:
//   Σ_{j∈A} g(x − x_j) ≈ Σ_{|k|≤p} a_k(X) M_k,   M_k = Σ_{j∈A} (c − x_j)^k,   a_k = ∂^k g(X)/k!,
// with the Taylor coefficients from the recurrence (derived from Q·∇ψ = −ν ψ ∇Q, Q = |X + h|², ν = s/2;
// the s = 1 case is that of Lindsay & Krasny, J. Comput. Phys. 172, 2001, eq. (16)):
//   |X|²|k| a_k = −(2|k| − 2 + s) Σ_i X_i a_{k−e_i} − (|k| − 2 + s) Σ_i a_{k−2e_i},   a_0 = |X|^(−s)
//   log:  |X|²|k| a_k = −2(|k| − 1) Σ_i X_i a_{k−e_i} − (|k| − 2) Σ_i a_{k−2e_i} − [k = e_i] X_i − [k = 2e_i],
//         a_0 = −log|X|.
// Error bounds: the degree-n part of the Taylor series is the n-th term of the Gegenbauer expansion
// |X − v|^(−s) = |X|^(−s) Σ_n C_n^(s/2)(cos γ) t^n, t = |v|/|X| (Abramowitz & Stegun 22.9.3), and
// |C_n^λ(cos γ)| ≤ C_n^λ(1) = (2λ)_n/n! for λ > 0 (Szegő, Orthogonal Polynomials, 7.33.1), so each
// pair has relative error at most δ(θ, p, s) = (1 + θ)^s Σ_{n>p} (s)_n/n! θ^n, and since all terms are
// positive the energy (and every potential) has relative error ≤ δ. For −log|x| the series is
// −log|X| + Σ_{n≥1} T_n(cos γ) t^n/n (A&S 22.9.8 with |T_n| ≤ 1), so each pair has absolute error at most
// θ^(p+1)/((p + 1)(1 − θ)); the bound of the energy is accumulated over the accepted interactions.
import type { Geometry, Kernel } from '../types'
import { EngineInputError } from '../errors'
import { CompensatedSum } from '../summation'
import { ENGINE_VERSION } from '../version'
import type { PointTree } from './quadtree'
import { buildTree } from './quadtree'
import { planPairSum } from './plan'

export interface TreecodeOptions {
  /** Requested relative error of the energy (default 1e−6). */
  readonly tolerance?: number
  /** Fixed Taylor order p (overrides the tolerance). */
  readonly order?: number
  /** Points per leaf (default 32). */
  readonly leafSize?: number
  /** Opening parameter θ in (0, 1) (default 0.5). */
  readonly theta?: number
}

export interface TreecodeParameters {
  readonly order: number
  readonly leafSize: number
  readonly theta: number
  readonly nodes: number
  readonly interactions: number
}

export interface TreecodeEnergyResult {
  /** Σ_{i<j} g(x_i − x_j). */
  readonly value: number
  /** Bound of the relative error from the truncation (rounding not included). */
  readonly errorBound: number
  readonly absoluteErrorBound: number
  readonly kernel: 'log' | 'power'
  readonly parameters: TreecodeParameters
  readonly engineVersion: string
}

export interface TreecodeFieldsResult {
  readonly potential: Float64Array
  /** −∇_{x_i} Σ_{j≠i} g(x_i − x_j), d numbers per point. */
  readonly force: Float64Array
  /** Bound of the relative error of every potential (power kernels). */
  readonly potentialErrorBound: number
  readonly parameters: TreecodeParameters
  readonly engineVersion: string
}

const MAX_ORDER = 30

/** δ(θ, p, s) = (1 + θ)^s Σ_{n>p} (s)_n/n! θ^n, the relative per-pair bound for |x|^(−s). */
export function rieszTail(theta: number, p: number, s: number): number {
  // (s)_n/n! θ^n by its ratio (s + n)/(n + 1)·θ
  let term = 1
  for (let n = 0; n <= p; n++) term *= ((s + n) / (n + 1)) * theta
  let sum = 0
  for (let n = p + 1; n < p + 100000; n++) {
    sum += term
    term *= ((s + n) / (n + 1)) * theta
    if (term < 1e-18 * sum && (s + n) * theta < 0.99 * (n + 1)) break
  }
  return Math.pow(1 + theta, s) * sum
}

/** θ^(p+1)/((p + 1)(1 − θ)), the absolute per-pair bound for −log|x|. */
export function logPairTail(theta: number, p: number): number {
  return Math.pow(theta, p + 1) / ((p + 1) * (1 - theta))
}

export interface MultiIndex {
  readonly count: number
  readonly kx: Int32Array
  readonly ky: Int32Array
  readonly kz: Int32Array
  readonly deg: Int32Array
  /** index of k − e_i (−1 when k_i = 0), i = x, y, z */
  readonly m1: Int32Array[]
  /** index of k − 2e_i */
  readonly m2: Int32Array[]
  /** index of k + e_i (for |k| < P) */
  readonly p1: Int32Array[]
}

/** All (k_x, k_y, k_z) with k_x + k_y + k_z ≤ P, by increasing degree. */
export function multiIndices(P: number): MultiIndex {
  const list: number[][] = []
  for (let n = 0; n <= P; n++) {
    for (let a = n; a >= 0; a--) {
      for (let b = n - a; b >= 0; b--) list.push([a, b, n - a - b])
    }
  }
  const key = (a: number, b: number, c: number): number => (a * (P + 2) + b) * (P + 2) + c
  const map = new Map<number, number>()
  list.forEach((k, i) => map.set(key(k[0], k[1], k[2]), i))
  const count = list.length
  const mk = (): Int32Array[] => [new Int32Array(count), new Int32Array(count), new Int32Array(count)]
  const idx: MultiIndex = { count, kx: new Int32Array(count), ky: new Int32Array(count), kz: new Int32Array(count), deg: new Int32Array(count), m1: mk(), m2: mk(), p1: mk() }
  list.forEach((k, i) => {
    idx.kx[i] = k[0]
    idx.ky[i] = k[1]
    idx.kz[i] = k[2]
    idx.deg[i] = k[0] + k[1] + k[2]
    for (let d = 0; d < 3; d++) {
      const m = k.slice()
      m[d] -= 1
      idx.m1[d][i] = m[d] >= 0 ? (map.get(key(m[0], m[1], m[2])) ?? -1) : -1
      m[d] -= 1
      idx.m2[d][i] = m[d] >= 0 ? (map.get(key(m[0], m[1], m[2])) ?? -1) : -1
      const q = k.slice()
      q[d] += 1
      idx.p1[d][i] = map.get(key(q[0], q[1], q[2])) ?? -1
    }
  })
  return idx
}

/** Per-index constants of the recurrence: c1 = −(2|k| − 2 + s)/|k|, c2 = −(|k| − 2 + s)/|k| (power), or
 *  c1 = −2(|k| − 1)/|k|, c2 = −(|k| − 2)/|k| (log); flat neighbour indices (0 stands for a zero slot). */
export interface Recurrence {
  readonly c1: Float64Array
  readonly c2: Float64Array
  /** 6 indices per k: k − e_x, k − e_y, k − e_z, k − 2e_x, k − 2e_y, k − 2e_z, shifted by one. */
  readonly nb: Int32Array
}

export function recurrence(idx: MultiIndex, log: boolean, s: number): Recurrence {
  const n = idx.count
  const c1 = new Float64Array(n)
  const c2 = new Float64Array(n)
  const nb = new Int32Array(6 * n)
  for (let i = 1; i < n; i++) {
    const k = idx.deg[i]
    c1[i] = log ? (-2 * (k - 1)) / k : -(2 * k - 2 + s) / k
    c2[i] = log ? -(k - 2) / k : -(k - 2 + s) / k
    for (let d = 0; d < 3; d++) {
      nb[6 * i + d] = idx.m1[d][i] + 1
      nb[6 * i + 3 + d] = idx.m2[d][i] + 1
    }
  }
  return { c1, c2, nb }
}

/** Taylor coefficients a_k(X), |k| ≤ P (the first `count` indices), into a[1..]; a[0] is a zero slot. */
export function taylor(rec: Recurrence, count: number, X: number, Y: number, Z: number, log: boolean, s: number, a: Float64Array): void {
  const R2 = X * X + Y * Y + Z * Z
  const inv = 1 / R2
  const { c1, c2, nb } = rec
  a[0] = 0
  a[1] = log ? -0.5 * Math.log(R2) : s === 1 ? 1 / Math.sqrt(R2) : Math.pow(R2, -s / 2)
  for (let i = 1; i < count; i++) {
    const o = 6 * i
    const s1 = X * a[nb[o]] + Y * a[nb[o + 1]] + Z * a[nb[o + 2]]
    const s2 = a[nb[o + 3]] + a[nb[o + 4]] + a[nb[o + 5]]
    a[i + 1] = (c1[i] * s1 + c2[i] * s2) * inv
  }
  if (log && count > 1) {
    // the inhomogeneous terms −[k = e_i] X_i/|k| and −[k = 2e_i]/|k| (indices 1..3 and 4, 7, 9 in degree order)
    a[2] -= X * inv
    a[3] -= Y * inv
    a[4] -= Z * inv
    if (count > 4) {
      // degree 2 depends on degree 1, recompute it with the corrected degree-1 values
      for (let i = 4; i < Math.min(count, 10); i++) {
        const o = 6 * i
        const s1 = X * a[nb[o]] + Y * a[nb[o + 1]] + Z * a[nb[o + 2]]
        const s2 = a[nb[o + 3]] + a[nb[o + 4]] + a[nb[o + 5]]
        a[i + 1] = (c1[i] * s1 + c2[i] * s2) * inv
      }
      a[5] -= 0.5 * inv
      a[8] -= 0.5 * inv
      a[10] -= 0.5 * inv
      for (let i = 10; i < count; i++) {
        const o = 6 * i
        const s1 = X * a[nb[o]] + Y * a[nb[o + 1]] + Z * a[nb[o + 2]]
        const s2 = a[nb[o + 3]] + a[nb[o + 4]] + a[nb[o + 5]]
        a[i + 1] = (c1[i] * s1 + c2[i] * s2) * inv
      }
    }
  }
}

/** Moments M_k = Σ_{j∈node} (c − x_j)^k, |k| ≤ p, of every node (computed from the points). */
function moments(tree: PointTree, idx: MultiIndex, p: number, count: number): Float64Array {
  const M = tree.start.length
  const out = new Float64Array(M * count)
  const P = tree.sorted
  const pw = [new Float64Array(p + 1), new Float64Array(p + 1), new Float64Array(p + 1)]
  for (let node = 0; node < M; node++) {
    const o = node * count
    for (let j = tree.start[node]; j < tree.end[node]; j++) {
      for (let d = 0; d < 3; d++) {
        const h = tree.centre[3 * node + d] - P[3 * j + d]
        pw[d][0] = 1
        for (let e = 1; e <= p; e++) pw[d][e] = pw[d][e - 1] * h
      }
      for (let i = 0; i < count; i++) out[o + i] += pw[0][idx.kx[i]] * pw[1][idx.ky[i]] * pw[2][idx.kz[i]]
    }
  }
  return out
}

interface Setup {
  tree: PointTree
  log: boolean
  s: number
  leaf: number
  theta: number
  tol: number
  N: number
  d: number
}

function setup(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry, options: TreecodeOptions): Setup {
  const plan = planPairSum(points, d, kernel, geometry)
  const tol = options.tolerance ?? 1e-6
  const leaf = options.leafSize ?? 32
  const theta = options.theta ?? 0.5
  if (!(tol > 0 && tol < 1)) throw new EngineInputError(`the tolerance must be in (0, 1) (got ${tol})`)
  if (!(theta > 0 && theta < 1)) throw new EngineInputError(`the opening parameter θ must be in (0, 1) (got ${theta})`)
  if (options.order !== undefined && !(Number.isInteger(options.order) && options.order >= 0 && options.order <= MAX_ORDER)) {
    throw new EngineInputError(`the Taylor order must be an integer in [0, ${MAX_ORDER}] (got ${options.order})`)
  }
  const N = points.length / d
  const p3 = new Float64Array(3 * N)
  for (let i = 0; i < N; i++) {
    for (let k = 0; k < d; k++) p3[3 * i + k] = points[i * d + k]
  }
  return { tree: buildTree(p3, 3, leaf), log: plan.kind === 'log', s: plan.s, leaf, theta, tol, N, d }
}

interface Sweep {
  phi: Float64Array
  force?: Float64Array
  bound: number
  interactions: number
}

/** φ_i (and with `forces` the forces) of every sorted point, by the tree traversal at order p. */
function sweep(st: Setup, p: number, forces: boolean): Sweep {
  const { tree, log, s, theta } = st
  const P = tree.sorted
  const N = st.N
  const Pmax = forces ? p + 1 : p
  const idx = multiIndices(Pmax)
  let count = 0
  while (count < idx.count && idx.deg[count] <= p) count++
  const mom = moments(tree, idx, p, count)
  const rec = recurrence(idx, log, s)
  const a = new Float64Array(idx.count + 1)
  const phi = new Float64Array(N)
  const force = forces ? new Float64Array(3 * N) : undefined
  const boundAcc = new CompensatedSum()
  let interactions = 0
  const stack: number[] = []
  for (let i = 0; i < N; i++) {
    const xi = P[3 * i]
    const yi = P[3 * i + 1]
    const zi = P[3 * i + 2]
    const acc = new CompensatedSum()
    let fx = 0
    let fy = 0
    let fz = 0
    let bnd = 0
    stack.length = 0
    stack.push(0)
    while (stack.length > 0) {
      const node = stack.pop() as number
      const X = xi - tree.centre[3 * node]
      const Y = yi - tree.centre[3 * node + 1]
      const Z = zi - tree.centre[3 * node + 2]
      const R = Math.sqrt(X * X + Y * Y + Z * Z)
      const r = tree.radius[node]
      if (R > 0 && r <= theta * R) {
        interactions++
        taylor(rec, idx.count, X, Y, Z, log, s, a)
        const o = node * count
        let v = 0
        for (let k = 0; k < count; k++) v += a[k + 1] * mom[o + k]
        acc.add(v)
        if (force) {
          for (let k = 0; k < count; k++) {
            const m = mom[o + k]
            fx -= (idx.kx[k] + 1) * a[idx.p1[0][k] + 1] * m
            fy -= (idx.ky[k] + 1) * a[idx.p1[1][k] + 1] * m
            fz -= (idx.kz[k] + 1) * a[idx.p1[2][k] + 1] * m
          }
        }
        if (log) bnd += (tree.end[node] - tree.start[node]) * logPairTail(r / R, p)
        continue
      }
      const ch = tree.children[node]
      if (ch.length > 0) {
        for (const c of ch) stack.push(c)
        continue
      }
      for (let j = tree.start[node]; j < tree.end[node]; j++) {
        if (j === i) continue
        const dx = xi - P[3 * j]
        const dy = yi - P[3 * j + 1]
        const dz = zi - P[3 * j + 2]
        const r2 = dx * dx + dy * dy + dz * dz
        if (r2 === 0) {
          const u = Math.min(tree.perm[i], tree.perm[j])
          const w = Math.max(tree.perm[i], tree.perm[j])
          throw new EngineInputError(`points ${u} and ${w} coincide; the interaction energy is infinite`, { indices: [u, w] })
        }
        if (log) {
          acc.add(-0.5 * Math.log(r2))
          if (force) {
            fx += dx / r2
            fy += dy / r2
            fz += dz / r2
          }
        }
        else {
          const g = s === 1 ? 1 / Math.sqrt(r2) : s === 2 ? 1 / r2 : Math.pow(r2, -s / 2)
          acc.add(g)
          if (force) {
            const f = (s * g) / r2
            fx += f * dx
            fy += f * dy
            fz += f * dz
          }
        }
      }
    }
    phi[i] = acc.value
    if (force) {
      force[3 * i] = fx
      force[3 * i + 1] = fy
      force[3 * i + 2] = fz
    }
    boundAcc.add(bnd)
  }
  return { phi, force, bound: boundAcc.value, interactions }
}

function halfSum(phi: Float64Array): number {
  const acc = new CompensatedSum()
  for (let i = 0; i < phi.length; i++) acc.add(phi[i])
  return 0.5 * acc.value
}

/** Σ_{i<j} g(x_i − x_j) by the tree code; p from the tolerance unless given. */
export function treecodeEnergy(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry, options: TreecodeOptions = {}): TreecodeEnergyResult {
  const st = setup(points, d, kernel, geometry, options)
  let p = options.order ?? -1
  if (p < 0) {
    p = MAX_ORDER
    if (!st.log) {
      for (let k = 0; k <= MAX_ORDER; k++) {
        if (rieszTail(st.theta, k, st.s) <= st.tol) {
          p = k
          break
        }
      }
    }
    else {
      // a lower bound of |E| from a pass at order 3, then the a-priori bound N(N − 1)/2 · θ^(p+1)/((p + 1)(1 − θ))
      const pilot = sweep(st, 3, false)
      const L = Math.abs(halfSum(pilot.phi)) - 0.5 * pilot.bound
      const pairs = (st.N * (st.N - 1)) / 2
      if (L > 0) {
        for (let k = 0; k <= MAX_ORDER; k++) {
          if (pairs * logPairTail(st.theta, k) <= 0.5 * st.tol * L) {
            p = k
            break
          }
        }
      }
    }
  }
  const r = sweep(st, p, false)
  const value = halfSum(r.phi)
  const abs = st.log ? 0.5 * r.bound : rieszTail(st.theta, p, st.s) * Math.abs(value)
  return {
    value,
    errorBound: st.log ? (value === 0 ? Infinity : abs / Math.abs(value)) : rieszTail(st.theta, p, st.s),
    absoluteErrorBound: abs,
    kernel: st.log ? 'log' : 'power',
    parameters: { order: p, leafSize: st.leaf, theta: st.theta, nodes: st.tree.start.length, interactions: r.interactions },
    engineVersion: ENGINE_VERSION,
  }
}

/** Potentials and forces by the tree code for |x|^(−s) or −log|x| in R^d (d ≤ 3) or on the sphere;
 *  with a tolerance, p is the smallest order with δ(θ, p, s) ≤ tolerance (power kernels) or
 *  θ^(p+1)/((p + 1)(1 − θ)) ≤ tolerance (log: absolute error per point pair). */
export function treecodeFields(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry, options: TreecodeOptions = {}): TreecodeFieldsResult {
  const st = setup(points, d, kernel, geometry, options)
  let p = options.order ?? -1
  if (p < 0) {
    p = MAX_ORDER
    for (let k = 0; k <= MAX_ORDER; k++) {
      if ((st.log ? logPairTail(st.theta, k) : rieszTail(st.theta, k, st.s)) <= st.tol) {
        p = k
        break
      }
    }
  }
  const r = sweep(st, Math.min(p, MAX_ORDER - 1), true)
  const N = st.N
  const potential = new Float64Array(N)
  const force = new Float64Array(N * d)
  for (let m = 0; m < N; m++) {
    const i = st.tree.perm[m]
    potential[i] = r.phi[m]
    for (let k = 0; k < d; k++) force[i * d + k] = (r.force as Float64Array)[3 * m + k]
  }
  return {
    potential,
    force,
    potentialErrorBound: st.log ? Infinity : rieszTail(st.theta, p, st.s),
    parameters: { order: p, leafSize: st.leaf, theta: st.theta, nodes: st.tree.start.length, interactions: r.interactions },
    engineVersion: ENGINE_VERSION,
  }
}
