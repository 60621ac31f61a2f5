// Eigenvalues of a complex upper-Hessenberg matrix by the shifted QR algorithm (and of a general complex
// matrix after Householder reduction to Hessenberg form, Golub & Van Loan §7.4): on the active
// unreduced block H[l..h, l..h], one step factors H − μI = QR with Givens rotations and forms
// RQ + μI (still Hessenberg, unitarily similar), with the Wilkinson shift μ (the eigenvalue of the
// trailing 2×2 block closest to its corner) and an exceptional shift after 10 and 20 fruitless steps.
// A subdiagonal entry is set to zero once |H_{k,k−1}| ≤ ε(|H_{k−1,k−1}| + |H_{kk}|) (moduli taken as
// |re| + |im|); a 1×1 block at the bottom gives an eigenvalue. Only the active block is updated, since
// eigenvalues alone are wanted. Sources: Golub & Van Loan, Matrix Computations, 4th ed. (2013), §7.5
// (practical QR, deflation, shifts); Martin & Wilkinson, "The modified LR algorithm for complex
// Hessenberg matrices", Numer. Math. 12 (1968), and the comqr procedure of EISPACK (complex QR with
// the same deflation test and exceptional shifts).
import { EngineInputError } from '../errors'

const EPS = 2.220446049250313e-16

/** An n×n complex matrix stored row-major as separate real and imaginary parts. */
export interface ComplexMatrix {
  readonly n: number
  readonly re: Float64Array
  readonly im: Float64Array
}

/** Eigenvalues as separate real and imaginary parts (in the order they deflate). */
export interface ComplexEigenvalues {
  readonly re: Float64Array
  readonly im: Float64Array
}

/** The eigenvalues of a complex upper-Hessenberg matrix (entries below the subdiagonal are ignored).
 *  The input is not modified. */
export function hessenbergEigenvalues(matrix: ComplexMatrix): ComplexEigenvalues {
  const { n } = matrix
  if (!Number.isInteger(n) || n < 1) throw new EngineInputError(`the matrix size must be an integer ≥ 1 (got ${n})`)
  if (matrix.re.length !== n * n || matrix.im.length !== n * n) throw new EngineInputError(`an ${n}×${n} matrix needs ${n * n} real and imaginary parts`)
  for (let k = 0; k < n * n; k++) {
    if (!Number.isFinite(matrix.re[k]) || !Number.isFinite(matrix.im[k])) throw new EngineInputError(`matrix entry (${Math.floor(k / n)}, ${k % n}) is not a finite number`, { index: k })
  }
  const re = Float64Array.from(matrix.re)
  const im = Float64Array.from(matrix.im)
  const outRe = new Float64Array(n)
  const outIm = new Float64Array(n)
  const cs = new Float64Array(n)
  const snRe = new Float64Array(n)
  const snIm = new Float64Array(n)
  let found = 0
  let h = n - 1
  let iterations = 0
  let totalIterations = 0
  const abs1 = (i: number, j: number): number => Math.abs(re[i * n + j]) + Math.abs(im[i * n + j])
  while (h >= 0) {
    // find the start l of the unreduced block ending at h
    let l = h
    for (; l > 0; l--) {
      const scale = abs1(l - 1, l - 1) + abs1(l, l)
      const sub = abs1(l, l - 1)
      if (sub <= EPS * scale || sub === 0) {
        re[l * n + l - 1] = 0
        im[l * n + l - 1] = 0
        break
      }
    }
    if (l === h) {
      outRe[found] = re[h * n + h]
      outIm[found] = im[h * n + h]
      found++
      h--
      iterations = 0
      continue
    }
    if (++totalIterations > 30 * n) throw new EngineInputError(`the complex QR iteration did not converge (${found} of ${n} eigenvalues found)`)
    iterations++
    // the shift
    let muRe: number
    let muIm: number
    const hh = h * n + h
    if (iterations === 10 || iterations === 20) {
      // exceptional shift (EISPACK comqr)
      muRe = Math.abs(re[h * n + h - 1]) + (h - 2 >= l ? Math.abs(re[(h - 1) * n + h - 2]) : 0) + re[hh]
      muIm = im[hh]
    }
    else {
      // eigenvalue of [[a, b], [c, dd]] closest to dd: dd − bc / (t + sign·√(t² + bc)), t = (a − dd)/2
      const aRe = re[(h - 1) * n + h - 1]
      const aIm = im[(h - 1) * n + h - 1]
      const bRe = re[(h - 1) * n + h]
      const bIm = im[(h - 1) * n + h]
      const cRe = re[h * n + h - 1]
      const cIm = im[h * n + h - 1]
      const dRe = re[hh]
      const dIm = im[hh]
      const tRe = (aRe - dRe) / 2
      const tIm = (aIm - dIm) / 2
      const bcRe = bRe * cRe - bIm * cIm
      const bcIm = bRe * cIm + bIm * cRe
      // √(t² + bc)
      const wRe = tRe * tRe - tIm * tIm + bcRe
      const wIm = 2 * tRe * tIm + bcIm
      const mod = Math.hypot(wRe, wIm)
      let sRe = Math.sqrt(Math.max(0, (mod + wRe) / 2))
      let sIm = Math.sqrt(Math.max(0, (mod - wRe) / 2))
      if (wIm < 0) sIm = -sIm
      if (tRe * sRe + tIm * sIm < 0) {
        sRe = -sRe
        sIm = -sIm
      }
      const denRe = tRe + sRe
      const denIm = tIm + sIm
      const den2 = denRe * denRe + denIm * denIm
      if (den2 === 0) {
        muRe = dRe
        muIm = dIm
      }
      else {
        // bc / den
        const qRe = (bcRe * denRe + bcIm * denIm) / den2
        const qIm = (bcIm * denRe - bcRe * denIm) / den2
        muRe = dRe - qRe
        muIm = dIm - qIm
      }
    }
    for (let k = l; k <= h; k++) {
      re[k * n + k] -= muRe
      im[k * n + k] -= muIm
    }
    // QR by Givens rotations G_k = [[c, s], [−s̄, c]] acting on rows k, k+1
    for (let k = l; k < h; k++) {
      const iA = k * n + k
      const iB = (k + 1) * n + k
      const aRe = re[iA]
      const aIm = im[iA]
      const bRe = re[iB]
      const bIm = im[iB]
      const absA = Math.hypot(aRe, aIm)
      const absB = Math.hypot(bRe, bIm)
      const r = Math.hypot(absA, absB)
      let c: number
      let sRe: number
      let sIm: number
      if (r === 0) {
        c = 1
        sRe = 0
        sIm = 0
      }
      else if (absA === 0) {
        // c = 0 and s = b̄/|b|, so that the new top entry s·b is |b|
        c = 0
        sRe = bRe / absB
        sIm = -bIm / absB
      }
      else {
        c = absA / r
        // s = (a/|a|)·b̄/r
        const uRe = aRe / absA
        const uIm = aIm / absA
        sRe = (uRe * bRe + uIm * bIm) / r
        sIm = (uIm * bRe - uRe * bIm) / r
      }
      cs[k] = c
      snRe[k] = sRe
      snIm[k] = sIm
      for (let j = k; j <= h; j++) {
        const p = k * n + j
        const q = (k + 1) * n + j
        const xRe = re[p]
        const xIm = im[p]
        const yRe = re[q]
        const yIm = im[q]
        // row k ← c x + s y;  row k+1 ← −s̄ x + c y
        re[p] = c * xRe + sRe * yRe - sIm * yIm
        im[p] = c * xIm + sRe * yIm + sIm * yRe
        re[q] = c * yRe - (sRe * xRe + sIm * xIm)
        im[q] = c * yIm - (sRe * xIm - sIm * xRe)
      }
      re[iB] = 0
      im[iB] = 0
    }
    // RQ: multiply by G_k^H on the right, columns k, k+1: col k ← c·col_k + s̄·col_{k+1}; col k+1 ← −s·col_k + c·col_{k+1}
    for (let k = l; k < h; k++) {
      const c = cs[k]
      const sRe = snRe[k]
      const sIm = snIm[k]
      const top = Math.min(k + 1, h)
      for (let i = l; i <= top; i++) {
        const p = i * n + k
        const q = p + 1
        const xRe = re[p]
        const xIm = im[p]
        const yRe = re[q]
        const yIm = im[q]
        re[p] = c * xRe + sRe * yRe + sIm * yIm
        im[p] = c * xIm + sRe * yIm - sIm * yRe
        re[q] = c * yRe - (sRe * xRe - sIm * xIm)
        im[q] = c * yIm - (sRe * xIm + sIm * xRe)
      }
    }
    for (let k = l; k <= h; k++) {
      re[k * n + k] += muRe
      im[k * n + k] += muIm
    }
  }
  return { re: outRe, im: outIm }
}

/** Reduces a general complex matrix to upper-Hessenberg form by Householder reflections,
 *  A ← P A P with P = I − 2vvᴴ for each column (Golub & Van Loan, §7.4); the result is
 *  unitarily similar to A (same eigenvalues). The input is not modified. */
export function reduceToHessenberg(matrix: ComplexMatrix): ComplexMatrix {
  const { n } = matrix
  if (!Number.isInteger(n) || n < 1) throw new EngineInputError(`the matrix size must be an integer ≥ 1 (got ${n})`)
  if (matrix.re.length !== n * n || matrix.im.length !== n * n) throw new EngineInputError(`an ${n}×${n} matrix needs ${n * n} real and imaginary parts`)
  const re = Float64Array.from(matrix.re)
  const im = Float64Array.from(matrix.im)
  const vRe = new Float64Array(n)
  const vIm = new Float64Array(n)
  for (let k = 0; k < n - 2; k++) {
    let norm2 = 0
    for (let r = k + 1; r < n; r++) norm2 += re[r * n + k] ** 2 + im[r * n + k] ** 2
    const x0Re = re[(k + 1) * n + k]
    const x0Im = im[(k + 1) * n + k]
    const x0Abs = Math.hypot(x0Re, x0Im)
    const tail = norm2 - x0Abs * x0Abs
    if (tail <= 0) continue // already zero below the subdiagonal
    const norm = Math.sqrt(norm2)
    // α = −e^{i arg x₀}‖x‖, v = x − α e₁ (no cancellation in the first entry)
    const phRe = x0Abs === 0 ? 1 : x0Re / x0Abs
    const phIm = x0Abs === 0 ? 0 : x0Im / x0Abs
    vRe.fill(0)
    vIm.fill(0)
    for (let r = k + 1; r < n; r++) {
      vRe[r] = re[r * n + k]
      vIm[r] = im[r * n + k]
    }
    vRe[k + 1] += phRe * norm
    vIm[k + 1] += phIm * norm
    let vNorm2 = 0
    for (let r = k + 1; r < n; r++) vNorm2 += vRe[r] ** 2 + vIm[r] ** 2
    const scale = 1 / Math.sqrt(vNorm2)
    for (let r = k + 1; r < n; r++) {
      vRe[r] *= scale
      vIm[r] *= scale
    }
    // left: A ← A − 2v(vᴴA) on rows k+1…n−1
    for (let c = k; c < n; c++) {
      let sRe = 0
      let sIm = 0
      for (let r = k + 1; r < n; r++) {
        const aRe = re[r * n + c]
        const aIm = im[r * n + c]
        sRe += vRe[r] * aRe + vIm[r] * aIm
        sIm += vRe[r] * aIm - vIm[r] * aRe
      }
      for (let r = k + 1; r < n; r++) {
        re[r * n + c] -= 2 * (vRe[r] * sRe - vIm[r] * sIm)
        im[r * n + c] -= 2 * (vRe[r] * sIm + vIm[r] * sRe)
      }
    }
    // right: A ← A − 2(Av)vᴴ on columns k+1…n−1
    for (let r = 0; r < n; r++) {
      let sRe = 0
      let sIm = 0
      for (let c = k + 1; c < n; c++) {
        const aRe = re[r * n + c]
        const aIm = im[r * n + c]
        sRe += aRe * vRe[c] - aIm * vIm[c]
        sIm += aRe * vIm[c] + aIm * vRe[c]
      }
      for (let c = k + 1; c < n; c++) {
        re[r * n + c] -= 2 * (sRe * vRe[c] + sIm * vIm[c])
        im[r * n + c] -= 2 * (sIm * vRe[c] - sRe * vIm[c])
      }
    }
    for (let r = k + 2; r < n; r++) {
      re[r * n + k] = 0
      im[r * n + k] = 0
    }
  }
  return { n, re, im }
}

/** Eigenvalues of a general complex matrix: Householder reduction, then shifted QR. */
export function complexEigenvalues(matrix: ComplexMatrix): ComplexEigenvalues {
  return hessenbergEigenvalues(reduceToHessenberg(matrix))
}
