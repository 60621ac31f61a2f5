// Periodic Coulomb energies by Ewald summation (P. P. Ewald, Ann. Phys. 369, 1921, 253–287).
// On the torus R^d/Λ (d = 2 with g = −log|x|, c_2 = 2π; d = 3 with g = 1/|x|, c_3 = 4π) the
// periodic Green function G is the solution with zero mean over the cell of
//   −ΔG = c_d (Σ_{p∈Λ} δ_p − 1/|Λ|),   G(x) = (c_d/|Λ|) Σ_{k∈2πΛ*, k≠0} e^{ik·x}/|k|².
// Splitting 1/|k|² = e^{−|k|²/(4α)}/|k|² + (1 − e^{−|k|²/(4α)})/|k|² gives, for α > 0,
//   G(x) = Σ_p ψ_α(|x + p|) + (c_d/|Λ|) Σ_{k≠0} e^{−|k|²/(4α)} e^{ik·x}/|k|² − c_d/(4α|Λ|),
// with ψ_α(r) = erfc(√α r)/r in 3-D and ψ_α(r) = ½E₁(α r²) in 2-D (both are g minus the
// potential of a normalised Gaussian (α/π)^{d/2} e^{−α|x|²}; c_d/(4α) = ∫ ψ_α over R^d).
// The self-image constant c₀(Λ) = lim_{x→0} (G(x) − g(x)) is the same sum over p ≠ 0 plus the
// limit of ψ_α − g at 0: −2√(α/π) in 3-D, −(γ + log α)/2 in 2-D.
//
// Energy of charges q_i at x_i (the canonical convention of this engine: every ordered pair counted):
//   E_q = Σ_{i≠j} q_i q_j G(x_i − x_j) + c₀ Σ_i q_i²,
// i.e. each charge interacts with all other charges, with all periodic images (its own included)
// and with a uniform background of total charge −Σ_j q_j spread over the cell. With q_i = 1 this
// is the jellium energy H_T = Σ_{i≠j} G(x_i − x_j) + N c₀. Evaluated as
//   E_q = Σ_{i≠j} q_i q_j Σ_p ψ_α(|x_ij + p|) + Σ_i q_i² Σ_{p≠0} ψ_α(|p|)
//       + (c_d/|Λ|) Σ_{k≠0} e^{−|k|²/(4α)} |Σ_j q_j e^{ik·x_j}|² / |k|²
//       − c_d (Σ_j q_j)² / (4α|Λ|) + s_α Σ_i q_i²,   s_α = −2√(α/π) (3-D), −(γ + log α)/2 (2-D).
// Sheet (interaction: 'sheet-coulomb'): a 2-D lattice with pair interaction 1/|x| and a uniform
// background in the plane; ψ_α(r) = erfc(√α r)/r, reciprocal weight (2π/|Λ|) erfc(|k|/(2√α))/|k|,
// constant −2√(π/α)/|Λ| (in place of −c_d/(4α|Λ|)), self term −2√(α/π) (Bonsall & Maradudin,
// Phys. Rev. B 15, 1977, appendix; the Fourier transform follows from 1/r = π^{−½}∫_0^∞ t^{−½}e^{−r²t}dt).
// Cut-offs: with s = √(log(1/tol)) + 1, real space |x + p| < s/√α, reciprocal space |k| ≤ 2s√α,
// so that both neglected tails are of order e^{−s²}. Sources: Ewald 1921; de Leeuw, Perram &
// Smith, Proc. R. Soc. Lond. A 373 (1980) (3-D sums); Frenkel & Smit, Understanding Molecular
// Simulation, 2nd ed. 2002, ch. 12 (Ewald sums). The 2-D log kernel follows from the same
// splitting with the 2-D Gaussian: −Δ(½E₁(αr²)) = 2πδ − 2α e^{−αr²} (direct computation in polar coordinates).
import { EngineInputError } from '../errors'
import { ENGINE_VERSION } from '../version'
import { CompensatedSum } from '../summation'
import { erfc, expint1, EULER_GAMMA } from './special-functions'
import { assertLattice, cellVolume, cubicLattice, dualBasis } from './lattice'
import { halfExpintPlusLogTable, scaledErfcTable, scaledExpintTable } from './tables'
import { chooseMesh, meshReciprocalSum } from './mesh'
import type { Lattice } from './lattice'
import type { Configuration } from '../types'

export interface EwaldOptions {
  /** Target size of each neglected tail, relative to one unit-charge pair term (default 1e-13). */
  tolerance?: number
  /** 'native' (default): g = −log|x| in 2-D, 1/|x| in 3-D. 'sheet-coulomb': a 2-D lattice with the
   *  pair interaction 1/|x| (charges and background confined to a plane of 3-D space). */
  interaction?: 'native' | 'sheet-coulomb'
  /** Splitting parameter α > 0 (the Gaussians are e^{−α|x|²}); by default 4π N^{1/d}/|Λ|^{2/d} for the
   *  sum over wave vectors and MESH_ALPHA_FACTOR (N/|Λ|)^{2/d} for the mesh. */
  alpha?: number
  /** How the reciprocal-space sum is taken: 'modes', over every wave vector within the cut-off
   *  (O(N · N^{1/2}) with the default α), or 'mesh', by smooth particle-mesh Ewald (mesh.ts, O(N log N),
   *  with its own error bound). By default 'mesh' from MESH_MIN_N points on. */
  reciprocal?: 'modes' | 'mesh'
}

/** From this many points on, torus energies take the reciprocal sum on a mesh. Measured 2026-12-03 on
 *  this machine (one thread, uniform points at density 1, tolerance 1e−13), seconds wave vectors / mesh:
 *  2-D N = 1e3 0.08 / 0.12, 3e3 0.29 / 0.11, 1e4 1.57 / 0.19, 3e4 8.2 / 0.80; 3-D N = 1e3 0.70 / 0.40,
 *  3e3 3.3 / 0.73 (bench/run.ts, section 5). */
export const MESH_MIN_N = 2000
/** Relative error allowed for in each real-space term ψ_α (the special functions are accurate to
 *  ≈ 1e−15, their scaled tables to < 1e−14, both checked in tests/reference/ewald*.test.ts). */
export const PAIR_RELATIVE_ERROR = 2e-14
/** α = MESH_ALPHA_FACTOR · (N/|Λ|)^{2/d} for the mesh route (measured, see MESH_MIN_N). */
export const MESH_ALPHA_FACTOR = { 2: 2, 3: 2 } as const

export interface EwaldParameters {
  readonly alpha: number
  readonly realCutoff: number
  readonly reciprocalCutoff: number
  readonly tolerance: number
  /** Number of real-space lattice translations and of reciprocal vectors k ≠ 0 (both signs) used. */
  readonly realImages: number
  readonly reciprocalVectors: number
  /** Energies: how the real-space terms were found ('cells': a cell list; 'pairs': every pair). */
  readonly realSpace?: 'cells' | 'pairs'
  /** Energies: how the reciprocal-space sum was taken, and for the mesh its size, spline order and bound. */
  readonly reciprocalSpace?: 'modes' | 'mesh'
  readonly mesh?: { readonly sizes: readonly number[], readonly splineOrder: number, readonly bound: number }
}

export interface TorusEnergyResult {
  /** E_q = Σ_{i≠j} q_i q_j G(x_i − x_j) + c₀ Σ q_i² (H_T for unit charges). */
  readonly value: number
  /** The self-image constant c₀(Λ). */
  readonly c0: number
  readonly N: number
  readonly d: 2 | 3
  readonly chargeTotal: number
  readonly parameters: EwaldParameters
  /** Estimate of the error: (Σ|q_i|)² times the continuum approximation of both tails, plus the mesh
   *  bound (mesh route), plus the rounding of the parts that cancel (PAIR_RELATIVE_ERROR times the sum of
   *  the real-space terms' sizes, 1e−15 times each other part). */
  readonly errorEstimate: number
  readonly engineVersion: string
}

export interface ConstantResult {
  readonly value: number
  readonly parameters: EwaldParameters
  readonly errorEstimate: number
  readonly engineVersion: string
}

interface Setup {
  d: 2 | 3
  volume: number
  cd: number
  params: EwaldParameters
  dual: Float64Array
  /** Real-space translations p within the cut-off reach, flat; p = 0 excluded. */
  images: Float64Array
  /** Reciprocal vectors k in a half space (k and −k counted once), flat, with their weights. */
  ks: Float64Array
  kWeights: Float64Array
  /** The integers m of each k = 2π Σ m_i b*_i (d per k) and their largest size per direction. */
  km: Int32Array
  mmax: number[]
  psi: (r: number) => number
  /** The weight of a half-space wave vector with |k|² = k2 (the factor 2 for −k included). */
  weight: (k2: number) => number
  /** ψ_α as a function of r², from the tables of tables.ts (for the pair loops). */
  psiOfSquare: (r2: number) => number
  /** ψ_α′(r)/r as a function of r² (∇ψ_α(|x|) = that times x), and ψ_α from the same evaluation into out[0]. */
  factorOfSquare: (r2: number, out: Float64Array) => number
  /** ψ_α′(r)/r by the special functions themselves (for the image sums of realSum). */
  factor: (r: number) => number
  selfLimit: number
  /** The constant term of G: −(1/|Λ|) ∫ (g − ψ_α) regularised, i.e. −c_d/(4α|Λ|) (−2√(π/α)/|Λ| for the sheet). */
  meanOffset: number
  tail: number
}

function prepare(lattice: Lattice, N: number, options: EwaldOptions, route: 'modes' | 'mesh' = 'modes'): Setup {
  assertLattice(lattice)
  const d = lattice.d
  const tolerance = options.tolerance ?? 1e-13
  if (!(tolerance > 0 && tolerance < 1)) throw new EngineInputError(`the Ewald tolerance must lie in (0, 1) (got ${tolerance})`)
  const volume = cellVolume(lattice)
  // default α: 4π N^{1/d}/|Λ|^{2/d}. Measured 2026-12-02 (one thread, N uniform points on the square
  // torus of area N, tolerance 1e−13): N = 1e4 with α at 1, 2, 4, 8 times π√N/|Λ| took 12.1 (every
  // pair), 6.4, 3.4, 3.6 s (cell list); N = 4e4 at 4, 8, 16 times took 27.7, 25.0, 33.5 s
  const alpha = options.alpha ?? (route === 'mesh'
    ? MESH_ALPHA_FACTOR[d] * Math.pow(Math.max(1, N) / volume, 2 / d)
    : (4 * Math.PI * Math.pow(Math.max(1, N), 1 / d)) / Math.pow(volume, 2 / d))
  if (!(alpha > 0 && Number.isFinite(alpha))) throw new EngineInputError(`the Ewald parameter α must be a finite number > 0 (got ${alpha})`)
  const s = Math.sqrt(Math.log(1 / tolerance)) + 1
  const rc = s / Math.sqrt(alpha)
  const kc = 2 * s * Math.sqrt(alpha)
  const sheet = options.interaction === 'sheet-coulomb'
  if (sheet && d !== 2) throw new EngineInputError('the sheet-coulomb interaction needs a 2-D lattice')
  const cd = d === 2 ? 2 * Math.PI : 4 * Math.PI
  const b = lattice.basis
  const dual = dualBasis(lattice)
  const norm = (v: Float64Array, i: number): number => {
    let t = 0
    for (let c = 0; c < d; c++) t += v[i * d + c] * v[i * d + c]
    return Math.sqrt(t)
  }
  // real-space translations: the reduced displacement has fractional coordinates in [−½, ½]
  const nmax: number[] = []
  for (let i = 0; i < d; i++) nmax.push(Math.floor(rc * norm(dual, i) + 0.5) + 1)
  const reach = rc + 0.5 * diameterBound(b, d)
  const imgs: number[] = []
  forEachInteger(nmax, d, (n) => {
    if (n.every(v => v === 0)) return
    const p = combine(n, b, d, 1)
    if (Math.hypot(...p) < reach) imgs.push(...p)
  })
  const mmax: number[] = []
  for (let i = 0; i < d; i++) mmax.push(Math.floor((kc * norm(b, i)) / (2 * Math.PI)) + 1)
  // factor 2 for −k; the sheet: 2-D Fourier transform of erf(√α r)/r is (2π/k) erfc(k/(2√α))
  const weight = sheet
    ? (k2: number) => ((2 * 2 * Math.PI) / volume) * (erfc(Math.sqrt(k2) / (2 * Math.sqrt(alpha))) / Math.sqrt(k2))
    : (k2: number) => ((2 * cd) / volume) * (Math.exp(-k2 / (4 * alpha)) / k2)
  const ks: number[] = []
  const kw: number[] = []
  const km: number[] = []
  if (route === 'modes') forEachInteger(mmax, d, (m) => {
    // half space: first non-zero component positive
    const first = m.find(v => v !== 0)
    if (first === undefined || first < 0) return
    const k = combine(m, dual, d, 2 * Math.PI)
    const k2 = k.reduce((t, v) => t + v * v, 0)
    if (k2 > kc * kc) return
    ks.push(...k)
    km.push(...m)
    kw.push(weight(k2))
  })
  const psi = d === 3 || sheet
    ? (r: number) => erfc(Math.sqrt(alpha) * r) / r
    : (r: number) => 0.5 * expint1(alpha * r * r)
  const psiOfSquare = d === 3 || sheet ? erfcOverR(alpha, rc) : halfExpint(alpha, rc)
  const factorOfSquare = d === 3 || sheet ? erfcOverRFactor(alpha, rc) : halfExpintFactor(alpha, rc)
  // d/dr ½E₁(αr²) = −e^{−αr²}/r; d/dr erfc(√α r)/r = −erfc(√α r)/r² − 2√(α/π) e^{−αr²}/r (elementary)
  const factor = d === 3 || sheet
    ? (r: number) => -(erfc(Math.sqrt(alpha) * r) / r + 2 * Math.sqrt(alpha / Math.PI) * Math.exp(-alpha * r * r)) / (r * r)
    : (r: number) => -Math.exp(-alpha * r * r) / (r * r)
  const selfLimit = d === 3 || sheet ? -2 * Math.sqrt(alpha / Math.PI) : -0.5 * (EULER_GAMMA + Math.log(alpha))
  const meanOffset = sheet ? -(2 * Math.sqrt(Math.PI / alpha)) / volume : -cd / (4 * alpha * volume)
  // continuum estimates of the neglected tails for one unit-charge pair
  let tail: number
  if (sheet) {
    const c = Math.sqrt(alpha)
    const u = kc / (2 * c)
    const realTail = ((2 * Math.PI) / volume) * (1 / c) * (Math.exp(-c * c * rc * rc) / Math.sqrt(Math.PI) - c * rc * erfc(c * rc))
    const recTail = 2 * c * (Math.exp(-u * u) / Math.sqrt(Math.PI) - u * erfc(u))
    tail = Math.abs(realTail) + recTail
  }
  else if (d === 3) {
    const c = Math.sqrt(alpha)
    const realTail = ((4 * Math.PI) / volume) * (-0.5 * rc * rc * erfc(c * rc) + (rc * Math.exp(-c * c * rc * rc)) / (2 * c * Math.sqrt(Math.PI)) + erfc(c * rc) / (4 * c * c))
    const recTail = (2 / Math.PI) * Math.sqrt(Math.PI * alpha) * erfc(kc / (2 * c))
    tail = Math.abs(realTail) + recTail
  }
  else {
    const u0 = alpha * rc * rc
    const realTail = (Math.PI / (2 * alpha * volume)) * (Math.exp(-u0) - u0 * expint1(u0))
    const recTail = 0.5 * expint1((kc * kc) / (4 * alpha))
    tail = Math.abs(realTail) + recTail
  }
  return {
    d,
    volume,
    cd,
    params: { alpha, realCutoff: rc, reciprocalCutoff: kc, tolerance, realImages: imgs.length / d, reciprocalVectors: 2 * kw.length },
    dual,
    images: Float64Array.from(imgs),
    ks: Float64Array.from(ks),
    kWeights: Float64Array.from(kw),
    km: Int32Array.from(km),
    mmax,
    psi,
    weight,
    psiOfSquare,
    factorOfSquare,
    factor,
    selfLimit,
    meanOffset,
    tail,
  }
}

/** ½E₁(α r²) from the tables of tables.ts: ½(E₁ + log)(x) − ½ log x below x = α r² = 1, ½e^{−x}(eˣE₁)(x) above. */
function halfExpint(alpha: number, rc: number): (r2: number) => number {
  const small = halfExpintPlusLogTable()
  const large = scaledExpintTable(alpha * rc * rc)
  return (r2: number) => {
    const x = alpha * r2
    return x < 1 ? small.evaluate(x) - 0.5 * Math.log(x) : 0.5 * Math.exp(-x) * large.evaluate(x)
  }
}

/** erfc(√α r)/r = e^{−αr²}(e^{y²}erfc)(y)/r, y = √α r, from a table on [0, √α r_c]. */
function erfcOverR(alpha: number, rc: number): (r2: number) => number {
  const c = Math.sqrt(alpha)
  const table = scaledErfcTable(c * rc)
  return (r2: number) => {
    const r = Math.sqrt(r2)
    return (Math.exp(-alpha * r2) * table.evaluate(c * r)) / r
  }
}

/** ψ = ½E₁(αr²) into out[0] (as halfExpint) and ψ′(r)/r = −e^{−αr²}/r², one exponential for both. */
function halfExpintFactor(alpha: number, rc: number): (r2: number, out: Float64Array) => number {
  const small = halfExpintPlusLogTable()
  const large = scaledExpintTable(alpha * rc * rc)
  return (r2: number, out: Float64Array) => {
    const x = alpha * r2
    const e = Math.exp(-x)
    out[0] = x < 1 ? small.evaluate(x) - 0.5 * Math.log(x) : 0.5 * e * large.evaluate(x)
    return -e / r2
  }
}

/** ψ = erfc(√α r)/r into out[0] and ψ′(r)/r = −(ψ + 2√(α/π) e^{−αr²})/r². */
function erfcOverRFactor(alpha: number, rc: number): (r2: number, out: Float64Array) => number {
  const c = Math.sqrt(alpha)
  const table = scaledErfcTable(c * rc)
  const two = 2 * Math.sqrt(alpha / Math.PI)
  return (r2: number, out: Float64Array) => {
    const r = Math.sqrt(r2)
    const e = Math.exp(-alpha * r2)
    const psi = (e * table.evaluate(c * r)) / r
    out[0] = psi
    return -(psi + two * e) / r2
  }
}

function diameterBound(b: Float64Array, d: number): number {
  let t = 0
  for (let i = 0; i < d; i++) {
    let n2 = 0
    for (let c = 0; c < d; c++) n2 += b[i * d + c] * b[i * d + c]
    t += Math.sqrt(n2)
  }
  return t
}

function forEachInteger(max: number[], d: number, visit: (n: number[]) => void): void {
  const n = max.map(m => -m)
  for (;;) {
    visit(n.slice())
    let i = d - 1
    while (i >= 0 && n[i] === max[i]) {
      n[i] = -max[i]
      i--
    }
    if (i < 0) return
    n[i]++
  }
}

function combine(n: number[], rows: Float64Array, d: number, scale: number): number[] {
  const out: number[] = new Array(d).fill(0)
  for (let i = 0; i < d; i++) for (let c = 0; c < d; c++) out[c] += scale * n[i] * rows[i * d + c]
  return out
}

/** Reduces a displacement to the cell centred at 0 (fractional coordinates in [−½, ½]). */
function reduce(setup: Setup, lattice: Lattice, x: ArrayLike<number>, xo: number, y: ArrayLike<number>, yo: number, out: Float64Array): void {
  const d = setup.d
  const b = lattice.basis
  const dual = setup.dual
  for (let c = 0; c < d; c++) out[c] = x[xo + c] - y[yo + c]
  const f = [0, 0, 0]
  for (let i = 0; i < d; i++) {
    let t = 0
    for (let c = 0; c < d; c++) t += dual[i * d + c] * out[c]
    f[i] = t - Math.round(t)
  }
  for (let c = 0; c < d; c++) {
    let t = 0
    for (let i = 0; i < d; i++) t += f[i] * b[i * d + c]
    out[c] = t
  }
}

/** Σ over real-space translations (p = 0 included when includeOrigin) of ψ_α(|x + p|) within the
 *  cut-off; with `gradient`, Σ ψ_α′(r)/r (x + p) over the same terms is written there. */
function realSum(setup: Setup, x: Float64Array, includeOrigin: boolean, gradient?: Float64Array): number {
  const d = setup.d
  const rc2 = setup.params.realCutoff * setup.params.realCutoff
  const img = setup.images
  gradient?.fill(0)
  let sum = 0
  // p = −d stands for the origin
  for (let p = includeOrigin ? -d : 0; p < img.length; p += d) {
    let r2 = 0
    for (let c = 0; c < d; c++) {
      const t = x[c] + (p < 0 ? 0 : img[p + c])
      r2 += t * t
    }
    if (!(r2 < rc2)) continue
    const r = Math.sqrt(r2)
    sum += setup.psi(r)
    if (gradient) {
      const f = setup.factor(r)
      for (let c = 0; c < d; c++) gradient[c] += f * (x[c] + (p < 0 ? 0 : img[p + c]))
    }
  }
  return sum
}

/** Σ_{i≠j} q_i q_j Σ_p ψ_α(|x_i − x_j + p|) over the terms within the real-space cut-off r_c, by a cell
 *  list: the cell is cut into n_k ≥ 3 slabs along each lattice direction k, with n_k = ⌊1/(r_c|b*_k|)⌋
 *  (b*_k the dual basis), so that a pair closer than r_c under some translation has fractional
 *  coordinates at most one slab apart, and each (i, j, p) within reach is met exactly once among the
 *  3^d neighbouring cells (translations across the cell's faces included). The same terms as the
 *  all-pairs loop, in another order, at a cost of about N·3^d·N/∏n_k pairs. Undefined when some
 *  n_k < 3 (the cut-off reaches across the cell; the caller sums all pairs). */
function realPairsByCells(setup: Setup, lattice: Lattice, points: ArrayLike<number>, charges: ArrayLike<number> | undefined, N: number, gradient?: Float64Array): { value: number, size: number } | undefined {
  const d = setup.d
  const b = lattice.basis
  const dual = setup.dual
  const rc = setup.params.realCutoff
  const n = [1, 1, 1]
  for (let k = 0; k < d; k++) {
    let n2 = 0
    for (let c = 0; c < d; c++) n2 += dual[k * d + c] * dual[k * d + c]
    n[k] = Math.floor(1 / (rc * Math.sqrt(n2)))
    if (!(n[k] >= 3)) return undefined
  }
  const cells = n[0] * n[1] * n[2]
  if (cells > 4 * N + 64) return undefined
  // the representative of every point inside the cell, and its cell
  const pos = new Float64Array(3 * N)
  const cellOf = new Int32Array(N)
  const idx = [0, 0, 0]
  for (let i = 0; i < N; i++) {
    for (let k = 0; k < d; k++) {
      let t = 0
      for (let c = 0; c < d; c++) t += dual[k * d + c] * points[i * d + c]
      let f = t - Math.floor(t)
      if (f >= 1) f -= 1
      for (let c = 0; c < d; c++) pos[3 * i + c] += f * b[k * d + c]
      idx[k] = Math.min(n[k] - 1, Math.floor(f * n[k]))
    }
    cellOf[i] = (idx[2] * n[1] + idx[1]) * n[0] + idx[0]
  }
  const start = new Int32Array(cells + 1)
  for (let i = 0; i < N; i++) start[cellOf[i] + 1]++
  for (let c = 0; c < cells; c++) start[c + 1] += start[c]
  const fill = start.slice(0, cells)
  const order = new Int32Array(N)
  for (let i = 0; i < N; i++) order[fill[cellOf[i]]++] = i
  const total = new CompensatedSum()
  const size = new Float64Array(1)
  // the 3^d neighbouring cells of every cell, with the translation taking a neighbour across a face
  const offsets = d === 3 ? 27 : 9
  const cellIndex = [0, 0, 0]
  const u = [0, 0, 0]
  const shift = [0, 0, 0]
  for (let home = 0; home < cells; home++) {
    if (start[home] === start[home + 1]) continue
    cellIndex[0] = home % n[0]
    cellIndex[1] = Math.floor(home / n[0]) % n[1]
    cellIndex[2] = Math.floor(home / (n[0] * n[1]))
    for (let o = 0; o < offsets; o++) {
      shift.fill(0)
      for (let k = 0; k < 3; k++) {
        u[k] = cellIndex[k] + (k < d ? (Math.floor(o / 3 ** k) % 3) - 1 : 0)
        const w = u[k] < 0 ? -1 : u[k] >= n[k] ? 1 : 0
        u[k] -= w * n[k]
        for (let c = 0; c < d && w !== 0; c++) shift[c] += w * b[k * d + c]
      }
      const other = (u[2] * n[1] + u[1]) * n[0] + u[0]
      total.add(cellPairs(order, start, home, other, pos, shift, charges, rc * rc, setup, size, gradient))
    }
  }
  return { value: total.value, size: size[0] }
}

/** Σ q_i q_j ψ(|x_i − (x_j + shift)|) (ψ from its tables) over i in cell `home`, j ≠ i in cell `other`,
 *  within the cut-off; Σ |q_i q_j| ψ is added to size[0]. With `gradient`, every term's
 *  2 q_i q_j ψ′(r)/r (x_i − x_j − shift) is added to the gradient of point i (each ordered pair is met
 *  once, and the term of (j, i) gives point j its share). */
function cellPairs(order: Int32Array, start: Int32Array, home: number, other: number, pos: Float64Array, shift: number[], charges: ArrayLike<number> | undefined, rc2: number, setup: Setup, size: Float64Array, gradient: Float64Array | undefined): number {
  const { psiOfSquare, factorOfSquare, d } = setup
  let sum = 0
  let comp = 0
  let abs = 0
  const psi = new Float64Array(1)
  for (let a = start[home]; a < start[home + 1]; a++) {
    const i = order[a]
    const qi = charges ? charges[i] : 1
    const xi = pos[3 * i] - shift[0]
    const yi = pos[3 * i + 1] - shift[1]
    const zi = pos[3 * i + 2] - shift[2]
    let gx = 0
    let gy = 0
    let gz = 0
    for (let e = start[other]; e < start[other + 1]; e++) {
      const j = order[e]
      if (j === i) continue
      const dx = xi - pos[3 * j]
      const dy = yi - pos[3 * j + 1]
      const dz = zi - pos[3 * j + 2]
      const r2 = dx * dx + dy * dy + dz * dz
      if (r2 >= rc2) continue
      if (r2 === 0) throw new EngineInputError(`points ${Math.min(i, j)} and ${Math.max(i, j)} coincide on the torus`, { indices: [Math.min(i, j), Math.max(i, j)] })
      const qq = qi * (charges ? charges[j] : 1)
      let t: number
      if (gradient) {
        const f = 2 * qq * factorOfSquare(r2, psi)
        t = qq * psi[0]
        gx += f * dx
        gy += f * dy
        gz += f * dz
      }
      else {
        t = qq * psiOfSquare(r2)
      }
      // Neumaier's compensated addition: a cell pair may hold 10⁵ terms
      const next = sum + t
      comp += Math.abs(sum) >= Math.abs(t) ? sum - next + t : t - next + sum
      sum = next
      abs += Math.abs(t)
    }
    if (gradient) {
      gradient[i * d] += gx
      gradient[i * d + 1] += gy
      if (d === 3) gradient[i * d + 2] += gz
    }
  }
  size[0] += abs
  return sum + comp
}

/** Σ_{k≠0} w_k |Σ_j q_j e^{ik·x_j}|² over the half space of k (the weights carry the factor 2). With
 *  k·x = 2π Σ_i m_i f_i(x) (f the fractional coordinates), e^{ik·x_j} is a product of one entry per
 *  direction from a table of e^{2πi m f} for the point, so each (k, point) costs a complex product
 *  (two in 3-D) instead of a cosine and a sine. */
function reciprocalSum(setup: Setup, points: ArrayLike<number>, charges: ArrayLike<number> | undefined, N: number, gradient?: Float64Array): number {
  const d = setup.d
  const K = setup.kWeights.length
  const phases = pointPhases(setup)
  const re = new Float64Array(K)
  const im = new Float64Array(K)
  for (let j = 0; j < N; j++) {
    const { er, ei } = phases(points, j)
    const q = charges ? charges[j] : 1
    for (let k = 0; k < K; k++) {
      re[k] += q * er[k]
      im[k] += q * ei[k]
    }
  }
  // ~10⁵–10⁶ terms of one sign: compensated, or the rounding of the running sum would dominate
  const sum = new CompensatedSum()
  for (let k = 0; k < K; k++) sum.add(setup.kWeights[k] * (re[k] * re[k] + im[k] * im[k]))
  if (gradient) {
    // ∇_j Σ_k w_k |S(k)|² = −2 q_j Σ_k w_k k Im(conj S(k) e^{ik·x_j}) (differentiating S)
    const ks = setup.ks
    const g = [0, 0, 0]
    for (let j = 0; j < N; j++) {
      const { er, ei } = phases(points, j)
      g[0] = g[1] = g[2] = 0
      for (let k = 0; k < K; k++) {
        const coef = setup.kWeights[k] * (re[k] * ei[k] - im[k] * er[k])
        for (let c = 0; c < d; c++) g[c] += coef * ks[k * d + c]
      }
      const q = charges ? charges[j] : 1
      for (let c = 0; c < d; c++) gradient[j * d + c] -= 2 * q * g[c]
    }
  }
  return sum.value
}

/** e^{ik·x_j} for every wave vector k of the setup, from one table of e^{2πi m f} per direction. */
function pointPhases(setup: Setup): (points: ArrayLike<number>, j: number) => { er: Float64Array, ei: Float64Array } {
  const d = setup.d
  const K = setup.kWeights.length
  const { km, mmax, dual } = setup
  const tables = mmax.map(M => ({ M, c: new Float64Array(2 * M + 1), s: new Float64Array(2 * M + 1) }))
  // table indices m + M of every k, per direction
  const at = mmax.map((M, i) => Int32Array.from({ length: K }, (_, k) => km[k * d + i] + M))
  const [t0, t1, t2] = [tables[0], tables[1], tables[2] ?? tables[1]]
  const [a0, a1, a2] = [at[0], at[1], at[2] ?? at[1]]
  const er = new Float64Array(K)
  const ei = new Float64Array(K)
  return (points, j) => {
    for (let i = 0; i < d; i++) {
      let f = 0
      for (let c = 0; c < d; c++) f += dual[i * d + c] * points[j * d + c]
      f -= Math.floor(f)
      const { M, c, s } = tables[i]
      c[M] = 1
      s[M] = 0
      for (let m = 1; m <= M; m++) {
        const phase = 2 * Math.PI * m * f
        c[M + m] = c[M - m] = Math.cos(phase)
        s[M + m] = Math.sin(phase)
        s[M - m] = -s[M + m]
      }
    }
    const c0 = t0.c
    const s0 = t0.s
    const c1 = t1.c
    const s1 = t1.s
    if (d === 2) {
      for (let k = 0; k < K; k++) {
        const x = c0[a0[k]]
        const y = s0[a0[k]]
        const u = c1[a1[k]]
        const v = s1[a1[k]]
        er[k] = x * u - y * v
        ei[k] = x * v + y * u
      }
    }
    else {
      const c2 = t2.c
      const s2 = t2.s
      for (let k = 0; k < K; k++) {
        const x = c0[a0[k]]
        const y = s0[a0[k]]
        const u = c1[a1[k]]
        const v = s1[a1[k]]
        const pr = x * u - y * v
        const pi = x * v + y * u
        const g = c2[a2[k]]
        const h = s2[a2[k]]
        er[k] = pr * g - pi * h
        ei[k] = pr * h + pi * g
      }
    }
    return { er, ei }
  }
}

/** The self-image constant c₀(Λ) = lim_{x→0} (G(x) − g(x)). */
export function selfImageConstant(lattice: Lattice, options: EwaldOptions = {}): ConstantResult {
  const setup = prepare(lattice, 1, options)
  const zero = new Float64Array(setup.d)
  const value = realSum(setup, zero, false) + reciprocalSum(setup, zero, undefined, 1) + setup.meanOffset + setup.selfLimit
  return { value, parameters: setup.params, errorEstimate: setup.tail, engineVersion: ENGINE_VERSION }
}

/** The periodic Green function G(x) (zero mean over the cell) at a displacement x ∉ Λ. */
export function periodicGreen(lattice: Lattice, x: ArrayLike<number>, options: EwaldOptions = {}): number {
  return periodicGreenFunction(lattice, options)(x)
}

/** G as a function, its Ewald setup (images, wave vectors, weights) prepared once for many calls. */
export function periodicGreenFunction(lattice: Lattice, options: EwaldOptions = {}): (x: ArrayLike<number>) => number {
  const setup = prepare(lattice, 1, options)
  const d = setup.d
  const r = new Float64Array(d)
  const origin = new Float64Array(d)
  return (x) => {
    if (x.length !== d) throw new EngineInputError(`the displacement needs ${d} coordinates (got ${x.length})`)
    reduce(setup, lattice, x, 0, origin, 0, r)
    if (r.every(v => v === 0)) throw new EngineInputError('G is infinite at a lattice point (the displacement is a period of the cell)')
    // e^{ik·x} + e^{−ik·x} = 2 cos(k·x): the weights already carry the factor 2
    let rec = 0
    for (let k = 0, w = 0; k < setup.ks.length; k += d, w++) {
      let phase = 0
      for (let c = 0; c < d; c++) phase += setup.ks[k + c] * r[c]
      rec += setup.kWeights[w] * Math.cos(phase)
    }
    return realSum(setup, r, true) + rec + setup.meanOffset
  }
}

/** E_q = Σ_{i≠j} q_i q_j G(x_i − x_j) + c₀ Σ q_i² for points (flat, d per point) on R^d/Λ;
 *  unit charges unless `charges` is given (then with a background of total charge −Σ q_i). */
export function torusEnergy(
  lattice: Lattice,
  points: ArrayLike<number>,
  options: EwaldOptions & { charges?: ArrayLike<number> } = {},
): TorusEnergyResult {
  return evaluate(lattice, points, options)
}

/** E_q as torusEnergy, and its gradient ∇_{x_i} E_q (flat, d per point) in closed form: the real-space
 *  terms through ψ_α′, the reciprocal ones by differentiating the structure factors (wave vectors) or
 *  the mesh splines (mesh.ts); the constant terms do not depend on the points. */
export function torusEnergyAndGradient(
  lattice: Lattice,
  points: ArrayLike<number>,
  options: EwaldOptions & { charges?: ArrayLike<number> } = {},
): TorusEnergyResult & { gradient: Float64Array } {
  const gradient = new Float64Array(points.length)
  const result = evaluate(lattice, points, options, gradient)
  return { ...result, gradient }
}

function evaluate(lattice: Lattice, points: ArrayLike<number>, options: EwaldOptions & { charges?: ArrayLike<number> }, gradient?: Float64Array): TorusEnergyResult {
  assertLattice(lattice)
  const d = lattice.d
  if (points.length % d !== 0) throw new EngineInputError(`the point list has ${points.length} numbers, not a multiple of d = ${d}`)
  const N = points.length / d
  if (N < 1) throw new EngineInputError('the configuration has no points')
  for (let i = 0; i < points.length; i++) {
    if (!Number.isFinite(points[i])) throw new EngineInputError(`coordinate ${i % d} of point ${Math.floor(i / d)} is not a finite number`, { index: Math.floor(i / d) })
  }
  const charges = options.charges
  if (charges !== undefined) {
    if (charges.length !== N) throw new EngineInputError(`there are ${charges.length} charges for ${N} points`)
    for (let i = 0; i < N; i++) if (!Number.isFinite(charges[i])) throw new EngineInputError(`charge ${i} is not a finite number`, { index: i })
  }
  const route = options.reciprocal ?? (N >= MESH_MIN_N ? 'mesh' : 'modes')
  if (route !== 'mesh' && route !== 'modes') throw new EngineInputError(`the reciprocal sum is taken over 'modes' or on a 'mesh' (got '${String(route)}')`)
  const setup = prepare(lattice, N, options, route)
  const q = (i: number): number => (charges ? charges[i] : 1)
  let sumQ = 0
  let sumQ2 = 0
  let sumAbs = 0
  for (let i = 0; i < N; i++) {
    sumQ += q(i)
    sumQ2 += q(i) * q(i)
    sumAbs += Math.abs(q(i))
  }
  const byCells = realPairsByCells(setup, lattice, points, charges, N, gradient)
  let real = byCells?.value ?? 0
  // Σ of the sizes of the real-space terms (ψ_α > 0), for the rounding estimate
  let realSize = byCells?.size ?? 0
  if (byCells === undefined) {
    const r = new Float64Array(d)
    const gr = new Float64Array(d)
    const pairs = new CompensatedSum()
    for (let i = 0; i < N; i++) {
      for (let j = i + 1; j < N; j++) {
        reduce(setup, lattice, points, i * d, points, j * d, r)
        if (r.every(v => v === 0)) throw new EngineInputError(`points ${i} and ${j} coincide on the torus`, { indices: [i, j] })
        const t = 2 * q(i) * q(j) * realSum(setup, r, true, gradient ? gr : undefined)
        pairs.add(t)
        realSize += Math.abs(t)
        if (gradient) {
          for (let c = 0; c < d; c++) {
            gradient[i * d + c] += 2 * q(i) * q(j) * gr[c]
            gradient[j * d + c] -= 2 * q(i) * q(j) * gr[c]
          }
        }
      }
    }
    real = pairs.value
  }
  const zero = new Float64Array(d)
  const ownImages = realSum(setup, zero, false)
  real += sumQ2 * ownImages
  realSize += sumQ2 * Math.abs(ownImages)
  let rec: number
  let c0: number
  let mesh: EwaldParameters['mesh']
  let reciprocalVectors = setup.params.reciprocalVectors
  if (route === 'mesh') {
    const spec = { d, basis: lattice.basis, dual: setup.dual, kc: setup.params.reciprocalCutoff, mmax: setup.mmax, weight: setup.weight, volume: setup.volume }
    const m = meshReciprocalSum(spec, chooseMesh(spec, N, setup.tail), points, charges, N, gradient)
    rec = m.value
    mesh = { sizes: m.sizes, splineOrder: m.order, bound: m.bound }
    reciprocalVectors = m.waveVectors
    // c₀ is a constant of the lattice: from its own (one-point) Ewald sum over wave vectors
    c0 = selfImageConstant(lattice, { tolerance: setup.params.tolerance, interaction: options.interaction }).value
  }
  else {
    rec = reciprocalSum(setup, points, charges, N, gradient)
    c0 = ownImages + reciprocalSum(setup, zero, undefined, 1) + setup.meanOffset + setup.selfLimit
  }
  const background = setup.meanOffset * sumQ * sumQ
  const self = setup.selfLimit * sumQ2
  const value = real + rec + background + self
  // rounding: each real-space term carries up to PAIR_RELATIVE_ERROR (the functions and their tables),
  // the other parts a few units of 1e−16 each (compensated sums), and the parts cancel down to the value
  const rounding = PAIR_RELATIVE_ERROR * realSize + 1e-15 * (Math.abs(rec) + Math.abs(background) + Math.abs(self))
  return {
    value,
    c0,
    N,
    d,
    chargeTotal: sumQ,
    parameters: { ...setup.params, reciprocalVectors, realSpace: byCells === undefined ? 'pairs' : 'cells', reciprocalSpace: route, ...(mesh ? { mesh } : {}) },
    errorEstimate: sumAbs * sumAbs * setup.tail + (mesh?.bound ?? 0) + rounding,
    engineVersion: ENGINE_VERSION,
  }
}

/** H_T of a configuration on the torus [0, L)^d (d = 2 log, d = 3 coulomb), unit charges. */
export function torusEnergyOfConfiguration(conf: Configuration, L: number, options: EwaldOptions = {}): TorusEnergyResult {
  if (conf.d !== 2 && conf.d !== 3) throw new EngineInputError(`torus energies by Ewald sums need d = 2 or 3 (got d = ${conf.d})`)
  if (conf.points.length !== conf.N * conf.d) throw new EngineInputError(`the configuration declares N = ${conf.N} points of dimension ${conf.d} but holds ${conf.points.length} numbers`)
  return torusEnergy(cubicLattice(conf.d, L), conf.points, options)
}
