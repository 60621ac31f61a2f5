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
import { erfc, expint1, EULER_GAMMA } from './special-functions'
import { assertLattice, cellVolume, cubicLattice, dualBasis } from './lattice'
import type { Lattice } from './lattice'
import type { Configuration } from '../types'

export interface EwaldOptions {
  /** Target size of each neglected tail, relative to one unit-charge pair term (default 1e-13). */
  tolerance?: number
  /** 'native' (default): g = −log|x| in 2-D, 1/|x| in 3-D. 'sheet-coulomb': a 2-D lattice with the
   *  pair interaction 1/|x| (charges and background confined to a plane of 3-D space). */
  interaction?: 'native' | 'sheet-coulomb'
  /** Splitting parameter α > 0 (the Gaussians are e^{−α|x|²}); by default π N^{1/d}/|Λ|^{2/d}. */
  alpha?: number
}

export interface EwaldParameters {
  readonly alpha: number
  readonly realCutoff: number
  readonly reciprocalCutoff: number
  readonly tolerance: number
  /** Number of real-space lattice translations and of reciprocal vectors k ≠ 0 (both signs) used. */
  readonly realImages: number
  readonly reciprocalVectors: number
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
  /** Estimate of the truncation error: (Σ|q_i|)² times the continuum approximation of both tails. */
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
  psi: (r: number) => number
  selfLimit: number
  /** The constant term of G: −(1/|Λ|) ∫ (g − ψ_α) regularised, i.e. −c_d/(4α|Λ|) (−2√(π/α)/|Λ| for the sheet). */
  meanOffset: number
  tail: number
}

function prepare(lattice: Lattice, N: number, options: EwaldOptions): Setup {
  assertLattice(lattice)
  const d = lattice.d
  const tolerance = options.tolerance ?? 1e-13
  if (!(tolerance > 0 && tolerance < 1)) throw new EngineInputError(`the Ewald tolerance must lie in (0, 1) (got ${tolerance})`)
  const volume = cellVolume(lattice)
  const alpha = options.alpha ?? (Math.PI * Math.pow(Math.max(1, N), 1 / d)) / Math.pow(volume, 2 / d)
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
  const ks: number[] = []
  const kw: number[] = []
  forEachInteger(mmax, d, (m) => {
    // half space: first non-zero component positive
    const first = m.find(v => v !== 0)
    if (first === undefined || first < 0) return
    const k = combine(m, dual, d, 2 * Math.PI)
    const k2 = k.reduce((t, v) => t + v * v, 0)
    if (k2 > kc * kc) return
    ks.push(...k)
    // factor 2 for −k; the sheet: 2-D Fourier transform of erf(√α r)/r is (2π/k) erfc(k/(2√α))
    if (sheet) kw.push(((2 * 2 * Math.PI) / volume) * (erfc(Math.sqrt(k2) / (2 * Math.sqrt(alpha))) / Math.sqrt(k2)))
    else kw.push(((2 * cd) / volume) * (Math.exp(-k2 / (4 * alpha)) / k2))
  })
  const psi = d === 3 || sheet
    ? (r: number) => erfc(Math.sqrt(alpha) * r) / r
    : (r: number) => 0.5 * expint1(alpha * r * r)
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
    psi,
    selfLimit,
    meanOffset,
    tail,
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

/** Σ over real-space translations (p = 0 included when includeOrigin) of ψ_α(|x + p|) within the cut-off. */
function realSum(setup: Setup, x: Float64Array, includeOrigin: boolean): number {
  const d = setup.d
  const rc2 = setup.params.realCutoff * setup.params.realCutoff
  const img = setup.images
  let sum = 0
  if (includeOrigin) {
    let r2 = 0
    for (let c = 0; c < d; c++) r2 += x[c] * x[c]
    if (r2 < rc2) sum += setup.psi(Math.sqrt(r2))
  }
  for (let p = 0; p < img.length; p += d) {
    let r2 = 0
    for (let c = 0; c < d; c++) {
      const t = x[c] + img[p + c]
      r2 += t * t
    }
    if (r2 < rc2) sum += setup.psi(Math.sqrt(r2))
  }
  return sum
}

function reciprocalSum(setup: Setup, points: ArrayLike<number>, charges: ArrayLike<number> | undefined, N: number): number {
  const d = setup.d
  const ks = setup.ks
  let sum = 0
  for (let k = 0, w = 0; k < ks.length; k += d, w++) {
    let re = 0
    let im = 0
    for (let j = 0; j < N; j++) {
      let phase = 0
      for (let c = 0; c < d; c++) phase += ks[k + c] * points[j * d + c]
      const q = charges ? charges[j] : 1
      re += q * Math.cos(phase)
      im += q * Math.sin(phase)
    }
    sum += setup.kWeights[w] * (re * re + im * im)
  }
  return sum
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
  const setup = prepare(lattice, 1, options)
  const d = setup.d
  if (x.length !== d) throw new EngineInputError(`the displacement needs ${d} coordinates (got ${x.length})`)
  const r = new Float64Array(d)
  reduce(setup, lattice, x, 0, new Float64Array(d), 0, r)
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

/** E_q = Σ_{i≠j} q_i q_j G(x_i − x_j) + c₀ Σ q_i² for points (flat, d per point) on R^d/Λ;
 *  unit charges unless `charges` is given (then with a background of total charge −Σ q_i). */
export function torusEnergy(
  lattice: Lattice,
  points: ArrayLike<number>,
  options: EwaldOptions & { charges?: ArrayLike<number> } = {},
): TorusEnergyResult {
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
  const setup = prepare(lattice, N, options)
  const q = (i: number): number => (charges ? charges[i] : 1)
  let sumQ = 0
  let sumQ2 = 0
  let sumAbs = 0
  for (let i = 0; i < N; i++) {
    sumQ += q(i)
    sumQ2 += q(i) * q(i)
    sumAbs += Math.abs(q(i))
  }
  const r = new Float64Array(d)
  let real = 0
  for (let i = 0; i < N; i++) {
    for (let j = i + 1; j < N; j++) {
      reduce(setup, lattice, points, i * d, points, j * d, r)
      if (r.every(v => v === 0)) throw new EngineInputError(`points ${i} and ${j} coincide on the torus`, { indices: [i, j] })
      real += 2 * q(i) * q(j) * realSum(setup, r, true)
    }
  }
  const zero = new Float64Array(d)
  const ownImages = realSum(setup, zero, false)
  const c0 = ownImages + reciprocalSum(setup, zero, undefined, 1) + setup.meanOffset + setup.selfLimit
  real += sumQ2 * ownImages
  const rec = reciprocalSum(setup, points, charges, N)
  const background = setup.meanOffset * sumQ * sumQ
  const value = real + rec + background + setup.selfLimit * sumQ2
  return {
    value,
    c0,
    N,
    d,
    chargeTotal: sumQ,
    parameters: setup.params,
    errorEstimate: sumAbs * sumAbs * setup.tail,
    engineVersion: ENGINE_VERSION,
  }
}

/** H_T of a configuration on the torus [0, L)^d (d = 2 log, d = 3 coulomb), unit charges. */
export function torusEnergyOfConfiguration(conf: Configuration, L: number, options: EwaldOptions = {}): TorusEnergyResult {
  if (conf.d !== 2 && conf.d !== 3) throw new EngineInputError(`torus energies by Ewald sums need d = 2 or 3 (got d = ${conf.d})`)
  if (conf.points.length !== conf.N * conf.d) throw new EngineInputError(`the configuration declares N = ${conf.N} points of dimension ${conf.d} but holds ${conf.points.length} numbers`)
  return torusEnergy(cubicLattice(conf.d, L), conf.points, options)
}
