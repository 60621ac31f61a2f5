// Discrete Fourier transforms of complex data, X(u) = Σ_t x(t) e^{−2πi t u/n}, for lengths n whose
// prime factors are 2, 3 and 5, by the self-sorting (Stockham) mixed-radix scheme: each pass splits
// the length by one radix r, combines r inputs a_t = x(q + s(p + t m)) (m = n/r) into
//   y(q + s(r p + u)) = e^{−2πi p u/(m r)} Σ_t a_t e^{−2πi t u/r},
// and hands the result to the next pass with the stride s multiplied by r, so the output comes out
// in natural order without a bit-reversal step (common practice; e.g. Van Loan, Computational
// Frameworks for the Fast Fourier Transform, SIAM 1992, §1.7). Multi-dimensional transforms apply it
// along each axis in turn. Twiddle factors are evaluated directly (no recurrences), so the rounding
// error grows like log n. The Ewald mesh needs real data on 2-D and 3-D meshes and only part of the
// spectrum, hence realSpectrumPruned and its inverse realFieldFromPruned below.
import { EngineInputError } from '../errors'

export interface FftPlan {
  readonly n: number
  readonly radices: readonly number[]
  /** cos and −sin of 2π j/n, j < n. */
  readonly cos: Float64Array
  readonly sin: Float64Array
}

/** The factors of n in 2, 3, 5 (4 taken as one radix where it can), or undefined when n has another prime factor. */
function radicesOf(n: number): number[] | undefined {
  const out: number[] = []
  let m = n
  while (m % 4 === 0) {
    out.push(4)
    m /= 4
  }
  for (const r of [2, 3, 5]) {
    while (m % r === 0) {
      out.push(r)
      m /= r
    }
  }
  return m === 1 ? out : undefined
}

/** The smallest n′ ≥ n whose prime factors are 2, 3 and 5. */
export function nextFftSize(n: number): number {
  let m = Math.max(1, Math.ceil(n))
  while (radicesOf(m) === undefined) m++
  return m
}

const plans = new Map<number, FftPlan>()

export function fftPlan(n: number): FftPlan {
  const known = plans.get(n)
  if (known) return known
  if (!(Number.isInteger(n) && n >= 1)) throw new EngineInputError(`an FFT length must be a positive integer (got ${n})`)
  const radices = radicesOf(n)
  if (!radices) throw new EngineInputError(`FFT lengths here have the prime factors 2, 3 and 5 only (got ${n}; try ${nextFftSize(n)})`)
  const cos = new Float64Array(n)
  const sin = new Float64Array(n)
  for (let j = 0; j < n; j++) {
    cos[j] = Math.cos((2 * Math.PI * j) / n)
    sin[j] = -Math.sin((2 * Math.PI * j) / n)
  }
  const plan = { n, radices, cos, sin }
  if (plans.size > 64) plans.clear()
  plans.set(n, plan)
  return plan
}

const C3 = -0.5
const S3 = -Math.sqrt(3) / 2
const C51 = Math.cos((2 * Math.PI) / 5)
const C52 = Math.cos((4 * Math.PI) / 5)
const S51 = -Math.sin((2 * Math.PI) / 5)
const S52 = -Math.sin((4 * Math.PI) / 5)

/** In-place forward transform of (re, im), both of length plan.n; wr and wi are scratch of the same length. */
export function fft(plan: FftPlan, re: Float64Array, im: Float64Array, wr: Float64Array, wi: Float64Array): void {
  const n = plan.n
  if (n === 1) return
  let xr = re
  let xi = im
  let yr = wr
  let yi = wi
  let s = 1
  let len = n
  for (const r of plan.radices) {
    const m = len / r
    // twiddle e^{−2πi p u/len} = table entry (p u n/len) mod n
    const step = n / len
    for (let p = 0; p < m; p++) {
      const base = p * step
      for (let q = 0; q < s; q++) {
        const i0 = q + s * p
        const o0 = q + s * r * p
        if (r === 2) {
          const ar = xr[i0]
          const ai = xi[i0]
          const br = xr[i0 + s * m]
          const bi = xi[i0 + s * m]
          yr[o0] = ar + br
          yi[o0] = ai + bi
          const dr = ar - br
          const di = ai - bi
          const c = plan.cos[base]
          const t = plan.sin[base]
          yr[o0 + s] = dr * c - di * t
          yi[o0 + s] = dr * t + di * c
        }
        else if (r === 4) {
          const sm = s * m
          const ar = xr[i0]
          const ai = xi[i0]
          const br = xr[i0 + sm]
          const bi = xi[i0 + sm]
          const cr = xr[i0 + 2 * sm]
          const ci = xi[i0 + 2 * sm]
          const dr = xr[i0 + 3 * sm]
          const di = xi[i0 + 3 * sm]
          // radix-4 butterfly: e^{−2πi/4} = −i
          const t0r = ar + cr
          const t0i = ai + ci
          const t1r = ar - cr
          const t1i = ai - ci
          const t2r = br + dr
          const t2i = bi + di
          const t3r = bi - di
          const t3i = dr - br
          yr[o0] = t0r + t2r
          yi[o0] = t0i + t2i
          twiddle(plan, base, 1, t1r + t3r, t1i + t3i, yr, yi, o0 + s)
          twiddle(plan, base, 2, t0r - t2r, t0i - t2i, yr, yi, o0 + 2 * s)
          twiddle(plan, base, 3, t1r - t3r, t1i - t3i, yr, yi, o0 + 3 * s)
        }
        else if (r === 3) {
          const sm = s * m
          const ar = xr[i0]
          const ai = xi[i0]
          const br = xr[i0 + sm]
          const bi = xi[i0 + sm]
          const cr = xr[i0 + 2 * sm]
          const ci = xi[i0 + 2 * sm]
          const sr = br + cr
          const si = bi + ci
          const mr = ar + C3 * sr
          const mi = ai + C3 * si
          // i·S3·(b − c), S3 the imaginary part of e^{−2πi/3}
          const nr = -S3 * (bi - ci)
          const ni = S3 * (br - cr)
          yr[o0] = ar + sr
          yi[o0] = ai + si
          twiddle(plan, base, 1, mr + nr, mi + ni, yr, yi, o0 + s)
          twiddle(plan, base, 2, mr - nr, mi - ni, yr, yi, o0 + 2 * s)
        }
        else {
          const sm = s * m
          const ar = xr[i0]
          const ai = xi[i0]
          const b1r = xr[i0 + sm] + xr[i0 + 4 * sm]
          const b1i = xi[i0 + sm] + xi[i0 + 4 * sm]
          const d1r = xr[i0 + sm] - xr[i0 + 4 * sm]
          const d1i = xi[i0 + sm] - xi[i0 + 4 * sm]
          const b2r = xr[i0 + 2 * sm] + xr[i0 + 3 * sm]
          const b2i = xi[i0 + 2 * sm] + xi[i0 + 3 * sm]
          const d2r = xr[i0 + 2 * sm] - xr[i0 + 3 * sm]
          const d2i = xi[i0 + 2 * sm] - xi[i0 + 3 * sm]
          yr[o0] = ar + b1r + b2r
          yi[o0] = ai + b1i + b2i
          const m1r = ar + C51 * b1r + C52 * b2r
          const m1i = ai + C51 * b1i + C52 * b2i
          const m2r = ar + C52 * b1r + C51 * b2r
          const m2i = ai + C52 * b1i + C51 * b2i
          // i·(S51 d1 + S52 d2) and i·(S52 d1 − S51 d2)
          const n1r = -(S51 * d1i + S52 * d2i)
          const n1i = S51 * d1r + S52 * d2r
          const n2r = -(S52 * d1i - S51 * d2i)
          const n2i = S52 * d1r - S51 * d2r
          twiddle(plan, base, 1, m1r + n1r, m1i + n1i, yr, yi, o0 + s)
          twiddle(plan, base, 2, m2r + n2r, m2i + n2i, yr, yi, o0 + 2 * s)
          twiddle(plan, base, 3, m2r - n2r, m2i - n2i, yr, yi, o0 + 3 * s)
          twiddle(plan, base, 4, m1r - n1r, m1i - n1i, yr, yi, o0 + 4 * s)
        }
      }
    }
    const tr = xr
    const ti = xi
    xr = yr
    xi = yi
    yr = tr
    yi = ti
    s *= r
    len = m
  }
  if (xr !== re) {
    re.set(xr)
    im.set(xi)
  }
}

function twiddle(plan: FftPlan, base: number, u: number, vr: number, vi: number, yr: Float64Array, yi: Float64Array, at: number): void {
  const j = (base * u) % plan.n
  const c = plan.cos[j]
  const t = plan.sin[j]
  yr[at] = vr * c - vi * t
  yi[at] = vr * t + vi * c
}

/** The spectrum of real data on a mesh of dims[0] × dims[1] (× dims[2]) values (first axis fastest), at
 *  the frequencies 0 ≤ u_0 ≤ keep[0] and |u_a| ≤ keep[a] on the other axes only, which is all the
 *  Ewald mesh reads. Two real lines go through one complex transform along the first axis
 *  (X = (Z(u) + conj Z(−u))/2 and (Z(u) − conj Z(−u))/(2i), common practice), and the later axes are
 *  transformed only for the frequencies kept so far. Returns the values at index
 *  u_0·S_0 + (u_1 mod dims[1]) (2-D) or (u_0·(2 keep[1] + 1) + u_1 + keep[1])·dims[2] + (u_2 mod dims[2]) (3-D). */
export function realSpectrumPruned(data: Float64Array, dims: readonly number[], keep: readonly number[]): { re: Float64Array, im: Float64Array } {
  const d = dims.length
  const K0 = dims[0]
  const K1 = dims[1]
  const K2 = d === 3 ? dims[2] : 1
  const k0 = keep[0]
  if (!(k0 < K0 / 2 && keep[1] < K1 / 2 && (d === 2 || keep[2] < K2 / 2))) throw new EngineInputError('the kept frequencies must lie below half the mesh size')
  const lines = K1 * K2
  // step 1: the first axis, two real lines per complex transform; out index (u0 · lines + line)
  const p0 = fftPlan(K0)
  const zr = new Float64Array(K0)
  const zi = new Float64Array(K0)
  const wr = new Float64Array(Math.max(K0, K1, K2))
  const wi = new Float64Array(Math.max(K0, K1, K2))
  const ar = new Float64Array((k0 + 1) * lines)
  const ai = new Float64Array((k0 + 1) * lines)
  for (let line = 0; line < lines; line += 2) {
    const two = line + 1 < lines
    for (let t = 0; t < K0; t++) {
      zr[t] = data[line * K0 + t]
      zi[t] = two ? data[(line + 1) * K0 + t] : 0
    }
    fft(p0, zr, zi, wr, wi)
    for (let u = 0; u <= k0; u++) {
      const v = u === 0 ? 0 : K0 - u
      const pr = zr[u]
      const pi = zi[u]
      const qr = zr[v]
      const qi = -zi[v]
      ar[u * lines + line] = 0.5 * (pr + qr)
      ai[u * lines + line] = 0.5 * (pi + qi)
      if (two) {
        // (Z(u) − conj Z(−u))/(2i)
        ar[u * lines + line + 1] = 0.5 * (pi - qi)
        ai[u * lines + line + 1] = -0.5 * (pr - qr)
      }
    }
  }
  // step 2: the second axis, contiguous lines (line = l1 + K1 l2)
  const p1 = fftPlan(K1)
  if (d === 2) {
    for (let u = 0; u <= k0; u++) fft(p1, ar.subarray(u * K1, (u + 1) * K1), ai.subarray(u * K1, (u + 1) * K1), wr.subarray(0, K1), wi.subarray(0, K1))
    return { re: ar, im: ai }
  }
  const k1 = keep[1]
  const w1 = 2 * k1 + 1
  const br = new Float64Array((k0 + 1) * w1 * K2)
  const bi = new Float64Array((k0 + 1) * w1 * K2)
  for (let u = 0; u <= k0; u++) {
    for (let l2 = 0; l2 < K2; l2++) {
      const o = u * lines + l2 * K1
      const lr = ar.subarray(o, o + K1)
      const li = ai.subarray(o, o + K1)
      fft(p1, lr, li, wr.subarray(0, K1), wi.subarray(0, K1))
      for (let m1 = -k1; m1 <= k1; m1++) {
        const at = (u * w1 + m1 + k1) * K2 + l2
        const from = m1 < 0 ? m1 + K1 : m1
        br[at] = lr[from]
        bi[at] = li[from]
      }
    }
  }
  // step 3: the third axis, contiguous lines
  const p2 = fftPlan(K2)
  for (let line = 0; line < (k0 + 1) * w1; line++) fft(p2, br.subarray(line * K2, (line + 1) * K2), bi.subarray(line * K2, (line + 1) * K2), wr.subarray(0, K2), wi.subarray(0, K2))
  return { re: br, im: bi }
}

/** Inverse transform for realSpectrumPruned's layout: Φ(l) = 2 Re Σ F(u) e^{+2πi u·l/K} over the kept
 *  frequencies (u_0 ≥ 0), on the whole mesh (first axis fastest). The later axes are transformed
 *  back first; along the first axis, F(u_0) and conj F(u_0) at −u_0 make a Hermitian line whose
 *  transform is real, so two lines go through one complex transform (common practice). Inverse
 *  transforms use conj(FFT(conj x)). */
export function realFieldFromPruned(fr: Float64Array, fi: Float64Array, dims: readonly number[], keep: readonly number[]): Float64Array {
  const d = dims.length
  const K0 = dims[0]
  const K1 = dims[1]
  const K2 = d === 3 ? dims[2] : 1
  const k0 = keep[0]
  const lines = K1 * K2
  const wr = new Float64Array(Math.max(K0, K1, K2))
  const wi = new Float64Array(Math.max(K0, K1, K2))
  const inverse = (plan: FftPlan, re: Float64Array, im: Float64Array): void => {
    for (let t = 0; t < re.length; t++) im[t] = -im[t]
    fft(plan, re, im, wr.subarray(0, re.length), wi.subarray(0, re.length))
    for (let t = 0; t < re.length; t++) im[t] = -im[t]
  }
  // ar/ai: index u0 · lines + (l1 + K1 l2), the first axis still in frequency
  let ar: Float64Array
  let ai: Float64Array
  const p1 = fftPlan(K1)
  if (d === 2) {
    ar = fr.slice()
    ai = fi.slice()
    for (let u = 0; u <= k0; u++) inverse(p1, ar.subarray(u * K1, (u + 1) * K1), ai.subarray(u * K1, (u + 1) * K1))
  }
  else {
    const k1 = keep[1]
    const w1 = 2 * k1 + 1
    const br = fr.slice()
    const bi = fi.slice()
    const p2 = fftPlan(K2)
    for (let line = 0; line < (k0 + 1) * w1; line++) inverse(p2, br.subarray(line * K2, (line + 1) * K2), bi.subarray(line * K2, (line + 1) * K2))
    ar = new Float64Array((k0 + 1) * lines)
    ai = new Float64Array((k0 + 1) * lines)
    const lr = new Float64Array(K1)
    const li = new Float64Array(K1)
    for (let u = 0; u <= k0; u++) {
      for (let l2 = 0; l2 < K2; l2++) {
        lr.fill(0)
        li.fill(0)
        for (let m1 = -k1; m1 <= k1; m1++) {
          const from = (u * w1 + m1 + k1) * K2 + l2
          const to = m1 < 0 ? m1 + K1 : m1
          lr[to] = br[from]
          li[to] = bi[from]
        }
        inverse(p1, lr, li)
        const o = u * lines + l2 * K1
        ar.set(lr, o)
        ai.set(li, o)
      }
    }
  }
  // the first axis: Hermitian lines, two per complex transform
  const out = new Float64Array(K0 * lines)
  const p0 = fftPlan(K0)
  const zr = new Float64Array(K0)
  const zi = new Float64Array(K0)
  for (let line = 0; line < lines; line += 2) {
    const two = line + 1 < lines
    zr.fill(0)
    zi.fill(0)
    for (let u = 0; u <= k0; u++) {
      // H_a(u) = F_a(u), H_a(−u) = conj F_a(u) (u = 0: 2 Re F_a(0)); Z = H_a + i H_b
      const xr = ar[u * lines + line]
      const xi = ai[u * lines + line]
      const yr = two ? ar[u * lines + line + 1] : 0
      const yi = two ? ai[u * lines + line + 1] : 0
      if (u === 0) {
        zr[0] = 2 * xr
        zi[0] = 2 * yr
        continue
      }
      zr[u] = xr - yi
      zi[u] = xi + yr
      zr[K0 - u] = xr + yi
      zi[K0 - u] = -xi + yr
    }
    inverse(p0, zr, zi)
    for (let t = 0; t < K0; t++) {
      out[line * K0 + t] = zr[t]
      if (two) out[(line + 1) * K0 + t] = zi[t]
    }
  }
  return out
}
