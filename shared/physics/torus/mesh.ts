// The reciprocal-space Ewald sum on a mesh: smooth particle-mesh Ewald (Essmann, Perera, Berkowitz,
// Darden, Lee & Pedersen, J. Chem. Phys. 103, 1995, 8577–8593), with an error bound of its own.
// With fractional coordinates u = (b*_i · x)_i and K_i mesh points along lattice direction i, each
// factor of e^{ik·x} = Π_i e^{2πi m_i u_i} is replaced by its interpolant in cardinal B-splines M_p of
// even order p,
//   e^{2πi m u} ≈ b(m) Σ_l M_p(uK − l) e^{2πi m l/K},  |b(m)|⁻² = |Σ_{k=0}^{p−2} M_p(k+1) e^{2πi m k/K}|²,
// so the structure factor S(k) = Σ_j q_j e^{ik·x_j} becomes Π_i b_i(m_i) times the discrete Fourier
// transform of the charges spread onto the mesh, and Σ_k w_k |S(k)|² costs N p^d + O(M log M) for a
// mesh of M points. Bound: by Poisson summation the interpolant equals e^{2πi m u}(1 + δ) with
//   δ = Σ_{j≠0} a_j (e^{2πi j K u} − 1) / Σ_j a_j,   a_j = sinc^p(m/K + j) ≥ 0 (p even),
// so |δ| ≤ ε(m) = 2 Σ_{j≠0} (|ξ|/|ξ + j|)^p with ξ = m/K (derived here from the Poisson summation
// formula and the Fourier transform of M_p, sinc^p times a phase; the same aliasing sums appear in
// Essmann et al. 1995, §II). A product over directions errs by at most Π(1 + ε_i) − 1 =: ε, so
// |S_mesh − S| ≤ ε Σ|q_j| and the energy errs by at most (Σ|q_j|)² Σ_k w_k (2ε + ε²): the same
// worst-case form as the Ewald tails (ewald.ts). The order and the mesh are chosen from a cost model so
// that this bound stays below the Ewald tail estimate; the bound actually reached is reported.
import { EngineInputError } from '../errors'
import { CompensatedSum } from '../summation'
import { nextFftSize, realFieldFromPruned, realSpectrumPruned } from './fft'

export interface MeshSpec {
  readonly d: 2 | 3
  /** Lattice basis b_i and dual basis b*_i (rows, flat, d × d), b_i · b*_j = δ_ij. */
  readonly basis: Float64Array
  readonly dual: Float64Array
  /** Reciprocal cut-off: the wave vectors k = 2π Σ m_i b*_i with |k| ≤ kc, half of them (first non-zero m_i > 0). */
  readonly kc: number
  /** The largest |m_i| per direction inside the cut-off. */
  readonly mmax: readonly number[]
  /** The weight w(|k|²) of a half-space wave vector (the factor 2 for −k included). */
  readonly weight: (k2: number) => number
  /** Volume (area) of the cell. */
  readonly volume: number
}

export interface MeshChoice {
  readonly sizes: readonly number[]
  readonly order: number
}

export interface MeshResult {
  /** Σ_k w_k |S(k)|² over the half-space wave vectors within the cut-off. */
  readonly value: number
  /** (Σ|q|)² Σ_k w_k (2ε_k + ε_k²): bound of |value − the exact sum over the same wave vectors|. */
  readonly bound: number
  readonly sizes: readonly number[]
  readonly order: number
  readonly waveVectors: number
}

/** M_p(w + j), j = 0..p−1, for w ∈ [0, 1) (the cardinal B-spline of order p, support [0, p]). */
export function bsplineWeights(p: number, w: number, out: Float64Array): void {
  out[0] = w
  out[1] = 1 - w
  for (let n = 3; n <= p; n++) {
    const inv = 1 / (n - 1)
    out[n - 1] = 0
    for (let j = n - 1; j >= 0; j--) {
      const x = w + j
      const left = out[j]
      const right = j > 0 ? out[j - 1] : 0
      out[j] = inv * (x * left + (n - x) * right)
    }
  }
}

/** ε(ξ) = 2 Σ_{j≠0} (|ξ|/|ξ + j|)^p for |ξ| < 1/2, with the tail beyond |j| = 8 bounded by an integral
 *  (Σ_{j>J} (x/(j ∓ x))^p ≤ x^p (J − x)^{1−p}/(p − 1)). */
export function splineAliasBound(xi: number, p: number): number {
  const x = Math.abs(xi)
  if (x === 0) return 0
  if (!(x < 0.5)) return Number.POSITIVE_INFINITY
  const J = 8
  let s = 0
  for (let j = J; j >= 1; j--) s += Math.pow(x / (j - x), p) + Math.pow(x / (j + x), p)
  s += (2 * Math.pow(x, p) * Math.pow(J - x, 1 - p)) / (p - 1)
  return 2 * s
}

/** |b(m)|² for m = −M..M on a mesh of K points, order p. */
function splineModuli(K: number, p: number, M: number): Float64Array {
  const w = new Float64Array(p)
  bsplineWeights(p, 0, w) // M_p(j), j = 0..p−1; M_p(0) = 0
  const out = new Float64Array(2 * M + 1)
  for (let m = -M; m <= M; m++) {
    let re = 0
    let im = 0
    for (let k = 0; k <= p - 2; k++) {
      const phase = (2 * Math.PI * m * k) / K
      re += w[k + 1] * Math.cos(phase)
      im += w[k + 1] * Math.sin(phase)
    }
    out[m + M] = 1 / (re * re + im * im)
  }
  return out
}

/** The a-priori estimate used to choose: a continuum of wave vectors in shells, each with the worst
 *  ε of its length (ξ_i ≤ |k|/(2πκ) when K_i ≥ κ|b_i|). */
function estimate(spec: MeshSpec, p: number, kappa: number): number {
  const { d, kc, volume } = spec
  const steps = 64
  const kmin = kc / (2 * steps)
  let s = 0
  const h = (kc - kmin) / steps
  for (let t = 0; t <= steps; t++) {
    const k = kmin + t * h
    const eps1 = splineAliasBound(k / (2 * Math.PI * kappa), p)
    const eps = Math.pow(1 + eps1, d) - 1
    const shell = d === 2 ? 2 * Math.PI * k : 4 * Math.PI * k * k
    const density = volume / Math.pow(2 * Math.PI, d) / 2
    s += (t === 0 || t === steps ? 0.5 : 1) * h * density * shell * spec.weight(k * k) * (2 * eps + eps * eps)
  }
  return s
}

function lengths(spec: MeshSpec): number[] {
  const out: number[] = []
  for (let i = 0; i < spec.d; i++) {
    let n2 = 0
    for (let c = 0; c < spec.d; c++) n2 += spec.basis[i * spec.d + c] ** 2
    out.push(Math.sqrt(n2))
  }
  return out
}

/** Relative costs, measured 2026-12-03 on this machine (one thread): about 5.5 ns per spline weight
 *  added to the mesh and 1.1 ns per mesh point and halving of the FFT. */
const SPREAD_NS = 5.5
const FFT_NS = 1.1

/** The cheapest (order, mesh) whose estimated bound per unit charge pair stays below `target`. */
export function chooseMesh(spec: MeshSpec, N: number, target: number): MeshChoice {
  const len = lengths(spec)
  let best: { cost: number, choice: MeshChoice } | undefined
  for (let p = 4; p <= 24; p += 2) {
    // ξ ≤ 0.45 at the cut-off at least
    let lo = spec.kc / (2 * Math.PI * 0.45)
    if (estimate(spec, p, lo) > target) {
      let hi = lo * 2
      let tries = 0
      while (estimate(spec, p, hi) > target && tries++ < 20) hi *= 2
      if (tries >= 20) continue
      for (let it = 0; it < 12; it++) {
        const mid = 0.5 * (lo + hi)
        if (estimate(spec, p, mid) > target) lo = mid
        else hi = mid
      }
      lo = hi
    }
    const sizes = len.map(l => nextFftSize(Math.max(p, Math.ceil(lo * l))))
    const M = sizes.reduce((t, v) => t * v, 1)
    const cost = SPREAD_NS * N * Math.pow(p, spec.d) + FFT_NS * M * Math.log2(M)
    if (!best || cost < best.cost) best = { cost, choice: { sizes, order: p } }
  }
  if (!best) throw new EngineInputError('no spline mesh reaches the requested Ewald tolerance; use the reciprocal sum over wave vectors (reciprocal: \'modes\')')
  return best.choice
}

/** Σ_k w_k |S(k)|² by the spline mesh, with its bound; with `gradient` (N·d values), its gradient in
 *  the point coordinates is added there: ∂E/∂x_i = Σ_l ∂Q(l)/∂x_i Φ(l), Φ(l) = 2 Re Σ_k w_k B(m) Q̂(m)
 *  e^{2πi m·l/K}, one inverse transform, and ∂/∂x of the splines from M_p′(x) = M_{p−1}(x) − M_{p−1}(x − 1)
 *  (de Boor 1978, ch. IX; the force of Essmann et al. 1995, §II). */
export function meshReciprocalSum(spec: MeshSpec, choice: MeshChoice, points: ArrayLike<number>, charges: ArrayLike<number> | undefined, N: number, gradient?: Float64Array): MeshResult {
  const { d, dual } = spec
  const p = choice.order
  const K = choice.sizes
  if (p % 2 !== 0 || p < 4) throw new EngineInputError(`the spline order must be even and ≥ 4 (got ${p})`)
  for (let i = 0; i < d; i++) {
    if (!(K[i] > 2 * spec.mmax[i])) throw new EngineInputError(`the mesh needs more than ${2 * spec.mmax[i]} points along direction ${i} (got ${K[i]})`)
  }
  const K0 = K[0]
  const K1 = K[1]
  const K2 = d === 3 ? K[2] : 1
  const total = K0 * K1 * K2
  const re = new Float64Array(total)
  // spread the charges: Q(l) = Σ_j q_j Π_i M_p(u_ji K_i − l_i), l_i taken mod K_i
  const { w, at, planes } = stencilBuffers(d, p)
  const fracs = [0, 0, 0]
  let sumAbs = 0
  // points in the order of the mesh row they start in (last axis slowest), so that consecutive points
  // touch the same rows of the mesh while those are in cache (counting sort, O(N + K))
  const rows = d === 3 ? K1 * K2 : K1
  const rowOf = new Int32Array(N)
  const inRow = new Int32Array(rows + 1)
  for (let j = 0; j < N; j++) {
    let key = 0
    for (let i = d - 1; i >= 1; i--) {
      let u = 0
      for (let c = 0; c < d; c++) u += dual[i * d + c] * points[j * d + c]
      u -= Math.floor(u)
      key = key * K[i] + Math.min(K[i] - 1, Math.floor(u * K[i]))
    }
    rowOf[j] = key
    inRow[key + 1]++
  }
  for (let r = 0; r < rows; r++) inRow[r + 1] += inRow[r]
  const sequence = new Int32Array(N)
  for (let j = 0; j < N; j++) sequence[inRow[rowOf[j]]++] = j
  for (let o = 0; o < N; o++) {
    const j = sequence[o]
    splineStencil(spec, choice, points, j, w, at, fracs)
    const q = charges ? charges[j] : 1
    sumAbs += Math.abs(q)
    const [w0, w1, w2] = w
    const [a0, a1, a2] = at
    // the first-axis indices run base, base − 1, … down, contiguous unless they wrap; in 2-D the
    // third axis is one plane of weight 1 (w2[0] = 1, a2[0] = 0)
    const top = a0[0]
    const flat = top >= p - 1
    for (let c = 0; c < planes; c++) {
      const plane = a2[c] * K1
      const qc = q * w2[c]
      for (let b = 0; b < p; b++) {
        const row = (plane + a1[b]) * K0
        const qb = qc * w1[b]
        if (flat) {
          const o = row + top
          for (let a = 0; a < p; a++) re[o - a] += qb * w0[a]
        }
        else {
          for (let a = 0; a < p; a++) re[row + a0[a]] += qb * w0[a]
        }
      }
    }
  }
  const spectrum = realSpectrumPruned(re, d === 3 ? [K0, K1, K2] : [K0, K1], spec.mmax)
  const sr = spectrum.re
  const si = spectrum.im
  const w1 = 2 * spec.mmax[1] + 1
  // Σ over half-space wave vectors within the cut-off of w_k B(m) |Q̂(m)|² (|Q̂(−m)| = |Q̂(m)|, Q real)
  const M = spec.mmax
  const B = K.slice(0, d).map((k, i) => splineModuli(k, p, M[i]))
  const E = K.slice(0, d).map((k, i) => Float64Array.from({ length: 2 * M[i] + 1 }, (_, t) => splineAliasBound((t - M[i]) / k, p)))
  const kc2 = spec.kc * spec.kc
  const fr = gradient ? new Float64Array(sr.length) : undefined
  const fi = gradient ? new Float64Array(sr.length) : undefined
  // ~10⁵–10⁷ terms of one sign: compensated, or the rounding of the running sum would dominate
  const value = new CompensatedSum()
  let boundSum = 0
  let count = 0
  const M2 = d === 3 ? M[2] : 0
  for (let m2 = -M2; m2 <= M2; m2++) {
    for (let m1 = -M[1]; m1 <= M[1]; m1++) {
      // half space: the first non-zero of (m0, m1, m2) positive, so m0 ≥ 0, and m0 = 0 needs m1 > 0 or m1 = 0 < m2
      for (let m0 = m1 > 0 || (m1 === 0 && m2 > 0) ? 0 : 1; m0 <= M[0]; m0++) {
        let k2 = 0
        for (let c = 0; c < d; c++) {
          const kc = 2 * Math.PI * (m0 * dual[c] + m1 * dual[d + c] + (d === 3 ? m2 * dual[2 * d + c] : 0))
          k2 += kc * kc
        }
        if (k2 > kc2) continue
        // the layout of realSpectrumPruned
        const idx = d === 2 ? m0 * K1 + (m1 < 0 ? m1 + K1 : m1) : (m0 * w1 + m1 + M[1]) * K2 + (m2 < 0 ? m2 + K2 : m2)
        let bm = B[0][m0 + M[0]] * B[1][m1 + M[1]]
        let grow = (1 + E[0][m0 + M[0]]) * (1 + E[1][m1 + M[1]])
        if (d === 3) {
          bm *= B[2][m2 + M2]
          grow *= 1 + E[2][m2 + M2]
        }
        const wk = spec.weight(k2)
        value.add(wk * bm * (sr[idx] * sr[idx] + si[idx] * si[idx]))
        if (fr && fi) {
          fr[idx] = wk * bm * sr[idx]
          fi[idx] = wk * bm * si[idx]
        }
        const eps = grow - 1
        boundSum += wk * (2 * eps + eps * eps)
        count++
      }
    }
  }
  if (gradient && fr && fi) meshGradient(spec, choice, realFieldFromPruned(fr, fi, d === 3 ? [K0, K1, K2] : [K0, K1], spec.mmax), points, charges, N, gradient)
  return { value: value.value, bound: sumAbs * sumAbs * boundSum, sizes: K.slice(0, d), order: p, waveVectors: 2 * count }
}

/** Weight and index buffers for one point's stencil; in 2-D the third axis is a single plane of
 *  weight 1 at index 0, so the spreading and the forces run one loop for both dimensions. */
function stencilBuffers(d: number, p: number): { w: Float64Array[], at: Int32Array[], planes: number } {
  const w = [new Float64Array(p), new Float64Array(p), new Float64Array(p)]
  const at = [new Int32Array(p), new Int32Array(p), new Int32Array(p)]
  if (d === 2) w[2][0] = 1
  return { w, at, planes: d === 3 ? p : 1 }
}

/** For point j and each direction i: the spline weights M_p(frac + s) into w[i], their mesh indices
 *  (base − s) mod K_i into at[i], s < p, and frac into fracs[i] (u K_i = base + frac). */
function splineStencil(spec: MeshSpec, choice: MeshChoice, points: ArrayLike<number>, j: number, w: Float64Array[], at: Int32Array[], fracs: number[]): void {
  const { d, dual } = spec
  const p = choice.order
  const K = choice.sizes
  for (let i = 0; i < d; i++) {
    let u = 0
    for (let c = 0; c < d; c++) u += dual[i * d + c] * points[j * d + c]
    u -= Math.floor(u)
    const t = u * K[i]
    let base = Math.floor(t)
    const frac = t - base
    fracs[i] = frac
    bsplineWeights(p, frac, w[i])
    if (base >= K[i]) base -= K[i]
    const ai = at[i]
    for (let s = 0; s < p; s++) {
      let l = base - s
      while (l < 0) l += K[i]
      ai[s] = l
    }
  }
}

/** Adds q_i Σ_a K_a b*_a Σ_l ∂_a[Π M_p](u_i K − l) Φ(l) to gradient[i·d …]. */
function meshGradient(spec: MeshSpec, choice: MeshChoice, phi: Float64Array, points: ArrayLike<number>, charges: ArrayLike<number> | undefined, N: number, gradient: Float64Array): void {
  const { d, dual } = spec
  const p = choice.order
  const K = choice.sizes
  const K0 = K[0]
  const K1 = K[1]
  const { w, at, planes } = stencilBuffers(d, p)
  // derivative weights; in 2-D the third axis keeps derivative 0 (its single weight is constant)
  const dw = [new Float64Array(p), new Float64Array(p), new Float64Array(p)]
  const lower = new Float64Array(p)
  const g = [0, 0, 0]
  const fracs = [0, 0, 0]
  for (let j = 0; j < N; j++) {
    splineStencil(spec, choice, points, j, w, at, fracs)
    for (let i = 0; i < d; i++) {
      bsplineWeights(p - 1, fracs[i], lower)
      lower[p - 1] = 0
      for (let s = 0; s < p; s++) dw[i][s] = lower[s] - (s > 0 ? lower[s - 1] : 0)
    }
    g[0] = g[1] = g[2] = 0
    const [w0, w1, w2] = w
    const [d0, d1, d2] = dw
    const [a0, a1, a2] = at
    for (let c = 0; c < planes; c++) {
      const plane = a2[c] * K1
      for (let b = 0; b < p; b++) {
        const row = (plane + a1[b]) * K0
        let s0 = 0
        let s1 = 0
        for (let a = 0; a < p; a++) {
          const v = phi[row + a0[a]]
          s0 += v * d0[a]
          s1 += v * w0[a]
        }
        g[0] += s0 * w1[b] * w2[c]
        g[1] += s1 * d1[b] * w2[c]
        g[2] += s1 * w1[b] * d2[c]
      }
    }
    const q = charges ? charges[j] : 1
    for (let c = 0; c < d; c++) {
      let v = 0
      for (let a = 0; a < d; a++) v += K[a] * g[a] * dual[a * d + c]
      gradient[j * d + c] += q * v
    }
  }
}
