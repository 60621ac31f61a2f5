// Cell–cell fast multipole method for the 3-D Coulomb kernel g(x) = 1/|x|: energy Σ_{i<j} 1/|x_i − x_j|,
// potentials φ_i = Σ_{j≠i} 1/|x_i − x_j| and forces F_i = Σ_{j≠i} (x_i − x_j)/|x_i − x_j|³, with
// Cartesian Taylor expansions after W. Dehnen, "A hierarchical O(N) force calculation algorithm",
// J. Comput. Phys. 179 (2002) 27–42:
//   P2M  M_k(A) = Σ_{j∈A} (c_A − x_j)^k, |k| ≤ p, at the leaves of the adaptive octree (quadtree.ts);
//   M2M  M_k(A) = Σ_{m≤k} C(k, m) (c_A − c_C)^(k−m) M_m(C) over the children C (exact);
//   M2L  for far pairs (r_A + r_B) ≤ θ|c_B − c_A| of the dual traversal (interactionLists):
//        L_n(B) += Σ_{|k|+|n|≤p} C(k + n, n) a_{k+n}(c_B − c_A) M_k(A), a_m = ∂^m g/m! (and A ↔ B);
//   L2L  L_m(C) = Σ_{n≥m} C(n, m) (c_C − c_B)^(n−m) L_n(B) (exact shift of a polynomial);
//   L2P  φ(y) += Σ_n L_n(B) (y − c_B)^n and −∇ of it;   P2P for near leaf pairs.
// Error bound. For y in B and x_j in A, Σ_{|k|+|n|≤p} C(k + n, n) a_{k+n}(R) u^n w^k with R = c_B − c_A,
// u = y − c_B, w = c_A − x_j equals Σ_{|m|≤p} a_m(R) (u + w)^m, the Taylor polynomial of degree p of
// g(R + u + w) = 1/|y − x_j| about R, and M2M, L2L, L2P are exact; so every far pair carries exactly the
// truncation error of that Taylor polynomial, whose degree-n part is |R|^(−1) P_n(cos γ) t^n,
// t = |u + w|/|R| ≤ (r_A + r_B)/|R| ≤ θ (Legendre expansion, Abramowitz & Stegun 22.9.3 with |P_n| ≤ 1,
// Szegő, Orthogonal Polynomials, 7.21.1). Hence each pair has relative error at most
//   δ(θ, p) = (1 + θ) θ^(p+1)/(1 − θ)
// (the factor 1 + θ from |R| ≥ |y − x_j|/(1 + θ); rieszTail(θ, p, 1) in treecode.ts), and since all
// terms are positive the energy and every potential have relative truncation error ≤ δ(θ, p). The
// order p is the smallest with δ(θ, p) ≤ tolerance (rounding not included). Forces use one order more
// (p + 1) so that the gradient of the local polynomial is of degree ≥ p; no relative bound is stated
// for forces.
// Energies take a shorter route (energyRun): no local expansions; each far pair of cells contributes
// its M2L contracted with the target's moments, truncated at total degree q_AB chosen per pair from
// its own θ_AB and an absolute error budget (the same Legendre bound, before dividing by the pair's
// energy), so pairs far apart relative to their size cost few terms; far pairs with fewer point pairs
// than expansion terms, and the near field, are summed directly with the SIMD kernels.
// Work: O(N) for a fixed p (Dehnen 2002); deterministic (fixed traversal order, compensated sums of
// the potentials and of the energy: Neumaier, Z. Angew. Math. Mech. 54 (1974) 39–51).
import { EngineInputError } from '../errors'
import { CompensatedSum } from '../summation'
import { ENGINE_VERSION } from '../version'
import type { PointTree } from './quadtree'
import { buildTree, interactionLists } from './quadtree'
import { PairKernels, wasmSimdAvailable } from './wasm'
import type { TreecodeEnergyResult, TreecodeFieldsResult, TreecodeOptions, TreecodeParameters } from './treecode'
import { multiIndices, recurrence, rieszTail, taylor } from './treecode'

export interface Fmm3dOptions extends TreecodeOptions {
  /** Energies: far pairs of cells with n_A·n_B at most this are summed directly (default: the
   *  C(q + 6, 6) terms of their expansion at their order q; 0 expands every far pair). */
  readonly farDirectUpTo?: number
}

export interface Fmm3dParameters extends TreecodeParameters {
  /** Energies: the mean order over the far pairs expanded (each has its own; `order` is the largest). */
  readonly meanOrder?: number
  /** Number of far (cell–cell, M2L) pairs, each applied in both directions. */
  readonly cellInteractions: number
  /** Number of near leaf pairs summed directly. */
  readonly nearPairs: number
}

export interface Fmm3dEnergyResult extends TreecodeEnergyResult {
  readonly method: 'fmm3d'
  readonly order: number
  readonly parameters: Fmm3dParameters
}

export interface Fmm3dFieldsResult extends TreecodeFieldsResult {
  readonly method: 'fmm3d'
  readonly order: number
  readonly errorBound: number
  readonly parameters: Fmm3dParameters
}

export const FMM3D_MAX_ORDER = 24
const DEFAULT_LEAF = 48

/** δ(θ, p) = (1 + θ) θ^(p+1)/(1 − θ), the relative per-pair truncation bound (see the header). */
export function fmm3dPairBound(theta: number, p: number): number {
  return rieszTail(theta, p, 1)
}

/** Default opening parameter for a tolerance: smaller θ (more M2L pairs, lower order) for tighter
 *  tolerances, so that p stays ≤ FMM3D_MAX_ORDER. */
export function fmm3dDefaultTheta(tolerance: number): number {
  return tolerance >= 1e-4 ? 0.5 : tolerance >= 1e-8 ? 0.4 : 0.3
}

/** Default opening parameter of the energy (each far pair at its own order): measured at N = 1e5,
 *  uniform points, 2026-12-02 on this machine, one thread: at 1e−3 θ = 0.3 / 0.4 / 0.5 / 0.6 / 0.7 took
 *  7.0 / 4.8 / 5.7 / 5.9 / 10.4 s; at 1e−6 θ = 0.25 / 0.3 / 0.4 / 0.5 took 13.5 / 11.4 / 12.4 / 14.9 s;
 *  at 1e−10 θ = 0.2 / 0.3 took 13.5 / 12.9 s. */
export function fmm3dEnergyTheta(tolerance: number): number {
  return tolerance >= 1e-4 ? 0.4 : 0.3
}

/** Smallest p with δ(θ, p) ≤ tolerance (−1 when none ≤ FMM3D_MAX_ORDER). */
export function fmm3dOrder(theta: number, tolerance: number): number {
  for (let p = 0; p <= FMM3D_MAX_ORDER; p++) {
    if (fmm3dPairBound(theta, p) <= tolerance) return p
  }
  return -1
}

interface Tables {
  /** number of multi-indices with |k| ≤ P */
  count: number
  kx: Int32Array
  ky: Int32Array
  kz: Int32Array
  deg: Int32Array
  /** index of k − e_d (−1 if k_d = 0) */
  m1: Int32Array[]
  /** for k ≠ 0: the index of k − e_d and the axis d, d the first axis with k_d > 0 (monomials) */
  up: Int32Array
  axis: Int32Array
  /** shift lists (k, m, k − m, C(k, m)) for M2M / L2L, m ≤ k */
  shK: Int32Array
  shM: Int32Array
  shD: Int32Array
  shC: Float64Array
  /** M2L lists (n, k, k + n, C(k + n, n), (−1)^|k+n|) */
  tN: Int32Array
  tK: Int32Array
  tS: Int32Array
  tC: Float64Array
  tSign: Float64Array
}

function binom(n: number, k: number): number {
  let r = 1
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i
  return r
}

const tableCache = new Map<number, Tables>()

function tables(P: number): Tables {
  const cached = tableCache.get(P)
  if (cached) return cached
  const idx = multiIndices(P)
  const count = idx.count
  const key = (a: number, b: number, c: number): number => (a * (P + 1) + b) * (P + 1) + c
  const map = new Map<number, number>()
  for (let i = 0; i < count; i++) map.set(key(idx.kx[i], idx.ky[i], idx.kz[i]), i)
  const shK: number[] = []
  const shM: number[] = []
  const shD: number[] = []
  const shC: number[] = []
  const tN: number[] = []
  const tK: number[] = []
  const tS: number[] = []
  const tC: number[] = []
  const tSign: number[] = []
  for (let k = 0; k < count; k++) {
    for (let m = 0; m < count; m++) {
      const dx = idx.kx[k] - idx.kx[m]
      const dy = idx.ky[k] - idx.ky[m]
      const dz = idx.kz[k] - idx.kz[m]
      if (dx >= 0 && dy >= 0 && dz >= 0) {
        shK.push(k)
        shM.push(m)
        shD.push(map.get(key(dx, dy, dz)) as number)
        shC.push(binom(idx.kx[k], idx.kx[m]) * binom(idx.ky[k], idx.ky[m]) * binom(idx.kz[k], idx.kz[m]))
      }
    }
  }
  for (let n = 0; n < count; n++) {
    for (let k = 0; k < count; k++) {
      if (idx.deg[n] + idx.deg[k] > P) continue
      const sx = idx.kx[n] + idx.kx[k]
      const sy = idx.ky[n] + idx.ky[k]
      const sz = idx.kz[n] + idx.kz[k]
      tN.push(n)
      tK.push(k)
      tS.push(map.get(key(sx, sy, sz)) as number)
      tC.push(binom(sx, idx.kx[n]) * binom(sy, idx.ky[n]) * binom(sz, idx.kz[n]))
      tSign.push((sx + sy + sz) % 2 === 0 ? 1 : -1)
    }
  }
  const t: Tables = {
    count,
    kx: idx.kx,
    ky: idx.ky,
    kz: idx.kz,
    deg: idx.deg,
    m1: idx.m1,
    up: Int32Array.from({ length: count }, (_, i) => (i === 0 ? 0 : idx.kx[i] > 0 ? idx.m1[0][i] : idx.ky[i] > 0 ? idx.m1[1][i] : idx.m1[2][i])),
    axis: Int32Array.from({ length: count }, (_, i) => (i === 0 ? 0 : idx.kx[i] > 0 ? 0 : idx.ky[i] > 0 ? 1 : 2)),
    shK: Int32Array.from(shK),
    shM: Int32Array.from(shM),
    shD: Int32Array.from(shD),
    shC: Float64Array.from(shC),
    tN: Int32Array.from(tN),
    tK: Int32Array.from(tK),
    tS: Int32Array.from(tS),
    tC: Float64Array.from(tC),
    tSign: Float64Array.from(tSign),
  }
  tableCache.set(P, t)
  return t
}

/** Monomials h^k, |k| ≤ P, into out. */
function monomials(T: Tables, hx: number, hy: number, hz: number, out: Float64Array): void {
  const { up, axis } = T
  out[0] = 1
  for (let i = 1; i < T.count; i++) {
    const d = axis[i]
    out[i] = out[up[i]] * (d === 0 ? hx : d === 1 ? hy : hz)
  }
}

interface Run {
  tree: PointTree
  /** φ of the sorted points */
  phi: Float64Array
  /** forces of the sorted points (with `forces`) */
  force?: Float64Array
  cellInteractions: number
  nearPairs: number
}

/** Moments M_k = Σ_{j∈A} (c_A − x_j)^k, |k| ≤ P, of the cells marked in `needed` (all cells when
 *  omitted), nodes·count numbers: from the points (P2M) where that is cheaper than shifting the
 *  children's (n·count(P) against children·C(P + 6, 6) operations) and at the leaves, else by M2M. */
function cellMoments(tree: PointTree, T: Tables, needed?: Uint8Array): Float64Array {
  const C = T.count
  const nodes = tree.start.length
  const { centre, children } = tree
  const X = tree.sorted
  const M = new Float64Array(nodes * C)
  const mono = new Float64Array(C)
  const want = needed ? Uint8Array.from(needed) : new Uint8Array(nodes).fill(1)
  const fromPoints = (a: number): boolean => children[a].length === 0 || (tree.end[a] - tree.start[a]) * C <= children[a].length * T.shK.length
  // a cell shifted from its children needs theirs (parents have smaller indices than children)
  for (let a = 1; a < nodes; a++) {
    if (want[tree.parent[a]] && !fromPoints(tree.parent[a])) want[a] = 1
  }
  for (let a = nodes - 1; a >= 0; a--) {
    if (!want[a]) continue
    const o = a * C
    const cx = centre[3 * a]
    const cy = centre[3 * a + 1]
    const cz = centre[3 * a + 2]
    if (fromPoints(a)) {
      for (let j = tree.start[a]; j < tree.end[a]; j++) {
        monomials(T, cx - X[3 * j], cy - X[3 * j + 1], cz - X[3 * j + 2], mono)
        for (let i = 0; i < C; i++) M[o + i] += mono[i]
      }
      continue
    }
    for (const c of children[a]) {
      monomials(T, cx - centre[3 * c], cy - centre[3 * c + 1], cz - centre[3 * c + 2], mono)
      const oc = c * C
      for (let q = 0; q < T.shK.length; q++) M[o + T.shK[q]] += T.shC[q] * mono[T.shD[q]] * M[oc + T.shM[q]]
    }
  }
  return M
}

function run(points: Float64Array, P: number, theta: number, leaf: number, forces: boolean): Run {
  const N = points.length / 3
  const tree = buildTree(points, 3, leaf)
  const lists = interactionLists(tree, theta)
  const X = tree.sorted
  const T = tables(P)
  const C = T.count
  const nodes = tree.start.length
  const M = cellMoments(tree, T)
  const L = new Float64Array(nodes * C)
  const mono = new Float64Array(C)
  const { centre, children } = tree
  // M2L for every far pair, both directions: a_m(−R) = (−1)^|m| a_m(R)
  const rec = recurrence(multiIndices(P), false, 1)
  const a = new Float64Array(C + 1)
  const { tN, tK, tS, tC, tSign } = T
  const nT = tN.length
  for (let f = 0; f < lists.farA.length; f++) {
    const A = lists.farA[f]
    const B = lists.farB[f]
    taylor(rec, C, centre[3 * B] - centre[3 * A], centre[3 * B + 1] - centre[3 * A + 1], centre[3 * B + 2] - centre[3 * A + 2], false, 1, a)
    const oA = A * C
    const oB = B * C
    for (let q = 0; q < nT; q++) {
      const g = tC[q] * a[tS[q] + 1]
      L[oB + tN[q]] += g * M[oA + tK[q]]
      L[oA + tN[q]] += tSign[q] * g * M[oB + tK[q]]
    }
  }
  // L2L downwards
  for (let b = 0; b < nodes; b++) {
    const ob = b * C
    for (const c of children[b]) {
      monomials(T, centre[3 * c] - centre[3 * b], centre[3 * c + 1] - centre[3 * b + 1], centre[3 * c + 2] - centre[3 * b + 2], mono)
      const oc = c * C
      for (let q = 0; q < T.shK.length; q++) L[oc + T.shM[q]] += T.shC[q] * mono[T.shD[q]] * L[ob + T.shK[q]]
    }
  }
  // per-point compensated potential sums (Neumaier), plain force sums
  const ps = new Float64Array(N)
  const pc = new Float64Array(N)
  const addPhi = (i: number, x: number): void => {
    const s = ps[i]
    const t = s + x
    if (Math.abs(s) >= Math.abs(x)) pc[i] += (s - t) + x
    else pc[i] += (x - t) + s
    ps[i] = t
  }
  const force = forces ? new Float64Array(3 * N) : undefined
  // L2P at the leaves
  for (let b = 0; b < nodes; b++) {
    if (children[b].length > 0) continue
    const ob = b * C
    for (let i = tree.start[b]; i < tree.end[b]; i++) {
      const ux = X[3 * i] - centre[3 * b]
      const uy = X[3 * i + 1] - centre[3 * b + 1]
      const uz = X[3 * i + 2] - centre[3 * b + 2]
      monomials(T, ux, uy, uz, mono)
      let v = 0
      for (let n = 0; n < C; n++) v += L[ob + n] * mono[n]
      addPhi(i, v)
      if (force) {
        let gx = 0
        let gy = 0
        let gz = 0
        for (let n = 1; n < C; n++) {
          const l = L[ob + n]
          if (T.kx[n] > 0) gx += T.kx[n] * l * mono[T.m1[0][n]]
          if (T.ky[n] > 0) gy += T.ky[n] * l * mono[T.m1[1][n]]
          if (T.kz[n] > 0) gz += T.kz[n] * l * mono[T.m1[2][n]]
        }
        force[3 * i] -= gx
        force[3 * i + 1] -= gy
        force[3 * i + 2] -= gz
      }
    }
  }
  // P2P for near leaf pairs (a = b: the pairs inside one leaf)
  const pair = (i: number, j: number): void => {
    const dx = X[3 * i] - X[3 * j]
    const dy = X[3 * i + 1] - X[3 * j + 1]
    const dz = X[3 * i + 2] - X[3 * j + 2]
    const r2 = dx * dx + dy * dy + dz * dz
    if (r2 === 0) {
      const u = Math.min(tree.perm[i], tree.perm[j])
      const w = Math.max(tree.perm[i], tree.perm[j])
      throw new EngineInputError(`points ${u} and ${w} coincide; the interaction energy is infinite`, { indices: [u, w] })
    }
    const g = 1 / Math.sqrt(r2)
    addPhi(i, g)
    addPhi(j, g)
    if (force) {
      const h = g / r2
      force[3 * i] += h * dx
      force[3 * i + 1] += h * dy
      force[3 * i + 2] += h * dz
      force[3 * j] -= h * dx
      force[3 * j + 1] -= h * dy
      force[3 * j + 2] -= h * dz
    }
  }
  for (let q = 0; q < lists.nearA.length; q++) {
    const A = lists.nearA[q]
    const B = lists.nearB[q]
    if (A === B) {
      for (let i = tree.start[A]; i < tree.end[A]; i++) {
        for (let j = i + 1; j < tree.end[A]; j++) pair(i, j)
      }
    }
    else {
      for (let i = tree.start[A]; i < tree.end[A]; i++) {
        for (let j = tree.start[B]; j < tree.end[B]; j++) pair(i, j)
      }
    }
  }
  const phi = new Float64Array(N)
  for (let i = 0; i < N; i++) phi[i] = ps[i] + pc[i]
  return { tree, phi, force, cellInteractions: lists.farA.length, nearPairs: lists.nearA.length }
}

interface EnergyTable {
  /** entries (n, k) with |n| + |k| ≤ P in increasing total degree: U_B index, M_A index, a index, C(n + k, n) */
  tN: Int32Array
  tK: Int32Array
  tS: Int32Array
  tC: Float64Array
  /** prefix[q] = number of entries of total degree ≤ q */
  prefix: Int32Array
}

const energyTableCache = new Map<number, EnergyTable>()

function energyTable(P: number): EnergyTable {
  const cached = energyTableCache.get(P)
  if (cached) return cached
  const T = tables(P)
  const order: number[] = []
  for (let q = 0; q < T.tN.length; q++) order.push(q)
  // stable sort by total degree, so that truncation at degree q is a prefix
  order.sort((x, y) => (T.deg[T.tN[x]] + T.deg[T.tK[x]]) - (T.deg[T.tN[y]] + T.deg[T.tK[y]]) || x - y)
  const prefix = new Int32Array(P + 1)
  for (const q of order) prefix[T.deg[T.tN[q]] + T.deg[T.tK[q]]]++
  for (let q = 1; q <= P; q++) prefix[q] += prefix[q - 1]
  const t: EnergyTable = {
    tN: Int32Array.from(order, q => T.tN[q]),
    tK: Int32Array.from(order, q => T.tK[q]),
    tS: Int32Array.from(order, q => T.tS[q]),
    tC: Float64Array.from(order, q => T.tC[q]),
    prefix,
  }
  energyTableCache.set(P, t)
  return t
}

/** Number of multi-indices k ∈ ℕ³ with |k| ≤ q. */
function countUpTo(q: number): number {
  return ((q + 1) * (q + 2) * (q + 3)) / 6
}

function coincident3(tree: PointTree, i: number, j: number): never {
  const u = Math.min(tree.perm[i], tree.perm[j])
  const w = Math.max(tree.perm[i], tree.perm[j])
  throw new EngineInputError(`points ${u} and ${w} coincide; the interaction energy is infinite`, { indices: [u, w] })
}

/** Σ 1/|x_i − x_j| over the leaf pairs (a, b) (a = b: the pairs inside one leaf), with the SIMD
 *  kernels when available. */
function nearCoulomb(tree: PointTree, A: number[], B: number[], kernels: PairKernels | undefined): number {
  const X = tree.sorted
  const total = new CompensatedSum()
  for (let q = 0; q < A.length; q++) {
    const a = A[q]
    const b = B[q]
    if (kernels) {
      const v = kernels.blockCoulomb3(tree.start[a], tree.end[a], tree.start[b], tree.end[b])
      if (Number.isNaN(v)) {
        const pair = kernels.coincidence()
        if (pair) coincident3(tree, pair[0], pair[1])
      }
      total.add(v)
      continue
    }
    for (let i = tree.start[a]; i < tree.end[a]; i++) {
      let row = 0
      for (let j = a === b ? i + 1 : tree.start[b]; j < tree.end[b]; j++) {
        const dx = X[3 * i] - X[3 * j]
        const dy = X[3 * i + 1] - X[3 * j + 1]
        const dz = X[3 * i + 2] - X[3 * j + 2]
        const r2 = dx * dx + dy * dy + dz * dz
        if (r2 === 0) coincident3(tree, i, j)
        row += 1 / Math.sqrt(r2)
      }
      total.add(row)
    }
  }
  return total.value
}

interface EnergyRun {
  tree: PointTree
  value: number
  absoluteBound: number
  maxOrder: number
  meanOrder: number
  cellInteractions: number
  nearPairs: number
}

/** The energy alone, without local expansions: for a far pair (A, B) with R = c_B − c_A the energy
 *  Σ_{i∈B, j∈A} 1/|x_i − x_j| truncated at total degree q is Σ_{|n|+|k|≤q} C(n + k, n) a_{n+k}(R)
 *  M_k(A) U_n(B), U_n(B) = Σ_{i∈B} (x_i − c_B)^n = (−1)^|n| M_n(B) (the M2L and L2P of the header
 *  contracted), with truncation error at most n_A n_B θ^(q+1)/((1 − θ)|R|) (the Legendre bound of
 *  the header, before dividing by the pair's own energy). Each far pair gets its own order q_AB, the
 *  smallest with θ^(q+1)/(1 − θ) ≤ τ, τ = tolerance·L/(2 Σ_far n_A n_B/|R|), L a lower bound of the
 *  energy (the exact near field plus n_A n_B/((1 + θ)|R|) per far pair): so the bounds, summed, stay
 *  below tolerance·L/2. Far pairs with few points are summed directly. */
function energyRun(points: Float64Array, tolerance: number, theta: number, leaf: number, fixedOrder: number | undefined, farDirectUpTo: number | undefined): EnergyRun {
  const tree = buildTree(points, 3, leaf)
  const lists = interactionLists(tree, theta)
  const { centre } = tree
  const kernels = wasmSimdAvailable() ? new PairKernels() : undefined
  kernels?.load(tree.sorted, 3)
  const near = nearCoulomb(tree, lists.nearA, lists.nearB, kernels)
  const F = lists.farA.length
  const weight = new Float64Array(F)
  const dist = new Float64Array(F)
  const low = new CompensatedSum().add(near)
  const share = new CompensatedSum()
  for (let f = 0; f < F; f++) {
    const A = lists.farA[f]
    const B = lists.farB[f]
    weight[f] = (tree.end[A] - tree.start[A]) * (tree.end[B] - tree.start[B])
    dist[f] = Math.hypot(centre[3 * B] - centre[3 * A], centre[3 * B + 1] - centre[3 * A + 1], centre[3 * B + 2] - centre[3 * A + 2])
    low.add(weight[f] / ((1 + lists.farRatio[f]) * dist[f]))
    share.add(weight[f] / dist[f])
  }
  const tau = share.value > 0 ? (0.5 * tolerance * low.value) / share.value : 1
  const orders = new Int32Array(F)
  const directA: number[] = []
  const directB: number[] = []
  const expanded: number[] = []
  const bound = new CompensatedSum()
  let P = 0
  let orderSum = 0
  for (let f = 0; f < F; f++) {
    const th = lists.farRatio[f]
    let q = fixedOrder ?? 0
    if (fixedOrder === undefined) {
      let t = th / (1 - th)
      while (q < FMM3D_MAX_ORDER && t > tau) {
        t *= th
        q++
      }
    }
    if (weight[f] <= (farDirectUpTo ?? ((q + 1) * (q + 2) * (q + 3) * (q + 4) * (q + 5) * (q + 6)) / 720)) {
      directA.push(lists.farA[f])
      directB.push(lists.farB[f])
      continue
    }
    orders[f] = q
    expanded.push(f)
    orderSum += q
    if (q > P) P = q
    bound.add((weight[f] * Math.pow(th, q + 1)) / ((1 - th) * dist[f]))
  }
  const direct = nearCoulomb(tree, directA, directB, kernels)
  const far = new CompensatedSum()
  if (expanded.length > 0) {
    const T = tables(P)
    const E = energyTable(P)
    const C = T.count
    const nodes = tree.start.length
    // moments only where a far pair needs them
    const needed = new Uint8Array(nodes)
    for (const f of expanded) {
      needed[lists.farA[f]] = 1
      needed[lists.farB[f]] = 1
    }
    const M = cellMoments(tree, T, needed)
    // U_n = (−1)^|n| M_n
    const U = new Float64Array(M.length)
    for (let a = 0; a < nodes; a++) {
      for (let i = 0; i < C; i++) U[a * C + i] = T.deg[i] % 2 === 0 ? M[a * C + i] : -M[a * C + i]
    }
    const rec = recurrence(multiIndices(P), false, 1)
    const coef = new Float64Array(C + 1)
    const { tN, tK, tS, tC, prefix } = E
    for (const f of expanded) {
      const A = lists.farA[f]
      const B = lists.farB[f]
      const q = orders[f]
      taylor(rec, countUpTo(q), centre[3 * B] - centre[3 * A], centre[3 * B + 1] - centre[3 * A + 1], centre[3 * B + 2] - centre[3 * A + 2], false, 1, coef)
      const oA = A * C
      const oB = B * C
      let e = 0
      const end = prefix[q]
      for (let t = 0; t < end; t++) e += tC[t] * coef[tS[t] + 1] * M[oA + tK[t]] * U[oB + tN[t]]
      far.add(e)
    }
  }
  return {
    tree,
    value: far.add(near).add(direct).value,
    absoluteBound: bound.value,
    maxOrder: P,
    meanOrder: expanded.length > 0 ? orderSum / expanded.length : 0,
    cellInteractions: expanded.length,
    nearPairs: lists.nearA.length + directA.length,
  }
}

interface Settings {
  p: number
  theta: number
  leaf: number
}

function settings(points: Float64Array, options: Fmm3dOptions, energy = false): Settings & { tol: number } {
  if (points.length % 3 !== 0) throw new EngineInputError(`the points must be flat triples x, y, z (got ${points.length} numbers)`)
  for (let k = 0; k < points.length; k++) {
    if (!Number.isFinite(points[k])) throw new EngineInputError(`point ${Math.floor(k / 3)} has a non-finite coordinate`, { indices: [Math.floor(k / 3)] })
  }
  const tol = options.tolerance ?? 1e-6
  if (!(tol > 0 && tol < 1)) throw new EngineInputError(`the tolerance must be in (0, 1) (got ${tol})`)
  const theta = options.theta ?? (energy ? fmm3dEnergyTheta(tol) : fmm3dDefaultTheta(tol))
  if (!(theta > 0 && theta < 1)) throw new EngineInputError(`the opening parameter θ must be in (0, 1) (got ${theta})`)
  const leaf = options.leafSize ?? DEFAULT_LEAF
  const p = options.order ?? fmm3dOrder(theta, tol)
  if (options.order !== undefined && !(Number.isInteger(p) && p >= 0 && p <= FMM3D_MAX_ORDER)) {
    throw new EngineInputError(`the expansion order must be an integer in [0, ${FMM3D_MAX_ORDER}] (got ${options.order})`)
  }
  if (p < 0 && !energy) throw new EngineInputError(`the tolerance ${tol} needs an expansion order above ${FMM3D_MAX_ORDER} at θ = ${theta}; use a smaller θ`)
  return { p, theta, leaf, tol }
}

function parameters(st: Settings, r: Run): Fmm3dParameters {
  return { order: st.p, leafSize: st.leaf, theta: st.theta, nodes: r.tree.start.length, interactions: r.cellInteractions, cellInteractions: r.cellInteractions, nearPairs: r.nearPairs }
}

/** Σ_{i<j} 1/|x_i − x_j| of points in R³ (flat x0, y0, z0, x1, …) by the fast multipole method, each
 *  far pair of cells at its own order (energyRun); the bound is the sum of the far pairs' bounds. */
export function fmm3dEnergy(points: Float64Array, options: Fmm3dOptions = {}): Fmm3dEnergyResult {
  const st = settings(points, options, true)
  if (options.farDirectUpTo !== undefined && !(options.farDirectUpTo >= 0)) throw new EngineInputError(`farDirectUpTo must be a number ≥ 0 (got ${options.farDirectUpTo})`)
  const r = energyRun(points, st.tol, st.theta, st.leaf, options.order, options.farDirectUpTo)
  const value = r.value
  const parameters: Fmm3dParameters = { order: r.maxOrder, meanOrder: r.meanOrder, leafSize: st.leaf, theta: st.theta, nodes: r.tree.start.length, interactions: r.cellInteractions, cellInteractions: r.cellInteractions, nearPairs: r.nearPairs }
  return { value, method: 'fmm3d', order: r.maxOrder, errorBound: value === 0 ? 0 : r.absoluteBound / value, absoluteErrorBound: r.absoluteBound, kernel: 'power', parameters, engineVersion: ENGINE_VERSION }
}

/** φ_i = Σ_{j≠i} 1/|x_i − x_j| and F_i = Σ_{j≠i} (x_i − x_j)/|x_i − x_j|³ by the fast multipole method
 *  (expansions of order p + 1, see the header). */
export function fmm3dFields(points: Float64Array, options: Fmm3dOptions = {}): Fmm3dFieldsResult {
  const st = settings(points, options)
  const r = run(points, Math.min(st.p + 1, FMM3D_MAX_ORDER + 1), st.theta, st.leaf, true)
  const N = points.length / 3
  const potential = new Float64Array(N)
  const force = new Float64Array(3 * N)
  const F = r.force as Float64Array
  for (let m = 0; m < N; m++) {
    const i = r.tree.perm[m]
    potential[i] = r.phi[m]
    for (let k = 0; k < 3; k++) force[3 * i + k] = F[3 * m + k]
  }
  const bound = fmm3dPairBound(st.theta, st.p)
  return { potential, force, method: 'fmm3d', order: st.p, errorBound: bound, potentialErrorBound: bound, parameters: parameters(st, r), engineVersion: ENGINE_VERSION }
}
