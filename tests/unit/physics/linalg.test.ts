import { describe, it, expect } from 'vitest'
import { bidiagonalGramEigenvalues, sturmCount, symmetricTridiagonalEigenvalues } from '../../../shared/physics/linalg/tridiagonal'
import { complexEigenvalues, hessenbergEigenvalues, reduceToHessenberg } from '../../../shared/physics/linalg/hessenberg'
import { createRng } from '../../../shared/physics/random'

describe('symmetric tridiagonal eigenvalues (implicit QL)', () => {
  it('gives 2 − 2cos(kπ/(N+1)) for the matrix with 2 on the diagonal and −1 off it', () => {
    // the discrete Laplacian with Dirichlet ends (common practice)
    for (const n of [1, 2, 7, 100, 400]) {
      const ev = symmetricTridiagonalEigenvalues(new Float64Array(n).fill(2), new Float64Array(n - 1).fill(-1))
      for (let k = 1; k <= n; k++) {
        const exact = 2 - 2 * Math.cos((k * Math.PI) / (n + 1))
        expect(Math.abs(ev[k - 1] - exact)).toBeLessThan(1e-13 * 4)
      }
    }
  })

  it('agrees with the Sturm count (inertia of T − xI) on random matrices', () => {
    const rng = createRng('tri')
    for (let trial = 0; trial < 20; trial++) {
      const n = 5 + rng.integer(60)
      const a = Float64Array.from({ length: n }, () => rng.normal())
      const b = Float64Array.from({ length: n - 1 }, () => rng.chi(1 + rng.integer(20)))
      const ev = symmetricTridiagonalEigenvalues(a, b)
      for (let k = 0; k < n; k++) {
        const scale = Math.max(1, Math.abs(ev[k]))
        expect(sturmCount(a, b, ev[k] - 1e-9 * scale)).toBe(k)
        expect(sturmCount(a, b, ev[k] + 1e-9 * scale)).toBe(k + 1)
      }
    }
  })

  it('keeps the trace and the Frobenius norm (Σλ = Σa, Σλ² = Σa² + 2Σb²)', () => {
    const rng = createRng(12)
    const n = 300
    const a = Float64Array.from({ length: n }, () => 3 * rng.normal())
    const b = Float64Array.from({ length: n - 1 }, () => rng.normal())
    const ev = symmetricTridiagonalEigenvalues(a, b)
    let tr = 0
    let fr = 0
    let s1 = 0
    let s2 = 0
    for (let k = 0; k < n; k++) {
      tr += a[k]
      fr += a[k] * a[k] + (k < n - 1 ? 2 * b[k] * b[k] : 0)
      s1 += ev[k]
      s2 += ev[k] * ev[k]
    }
    expect(Math.abs(s1 - tr)).toBeLessThan(1e-11 * fr)
    expect(Math.abs(s2 - fr)).toBeLessThan(1e-12 * fr)
  })

  it('finds the zeros of the Hermite polynomial H_n from its Jacobi matrix (Golub & Welsch, Math. Comp. 23, 1969)', () => {
    // H_{k+1} = 2x H_k − 2k H_{k−1}: Jacobi matrix with zero diagonal and off-diagonal √(k/2)
    const n = 20
    const ev = symmetricTridiagonalEigenvalues(new Float64Array(n), Float64Array.from({ length: n - 1 }, (_, k) => Math.sqrt((k + 1) / 2)))
    const hermite = (x: number): [number, number] => {
      let p0 = 1
      let p1 = 2 * x
      for (let k = 1; k < n; k++) {
        const p2 = 2 * x * p1 - 2 * k * p0
        p0 = p1
        p1 = p2
      }
      return [p1, 2 * n * p0] // H_n and H_n' = 2n H_{n−1}
    }
    for (const x of ev) {
      const [h, dh] = hermite(x)
      expect(Math.abs(h / dh)).toBeLessThan(1e-13 * Math.max(1, Math.abs(x))) // Newton correction
    }
  })

  it('gives the squared singular values of a bidiagonal matrix', () => {
    // B = [[1, 0], [1, 1]]: BBᵀ = [[1, 1], [1, 2]], eigenvalues (3 ∓ √5)/2
    const ev = bidiagonalGramEigenvalues([1, 1], [1])
    expect(ev[0]).toBeCloseTo((3 - Math.sqrt(5)) / 2, 14)
    expect(ev[1]).toBeCloseTo((3 + Math.sqrt(5)) / 2, 14)
  })

  it('reports bad input with the index', () => {
    expect(() => symmetricTridiagonalEigenvalues([1, Number.NaN], [0])).toThrow(/diagonal entry 1/)
    expect(() => symmetricTridiagonalEigenvalues([1, 2], [])).toThrow(/off-diagonal/)
  })
})

describe('complex Hessenberg eigenvalues (shifted QR)', () => {
  it('finds the N-th roots of unity from the companion matrix of z^N − 1', () => {
    const n = 12
    const re = new Float64Array(n * n)
    const im = new Float64Array(n * n)
    for (let i = 1; i < n; i++) re[i * n + i - 1] = 1
    re[n - 1] = 1 // last column: coefficients of z^N = 1
    const ev = hessenbergEigenvalues({ n, re, im })
    const angles = Array.from(ev.re, (x, k) => Math.atan2(ev.im[k], x)).map(a => (a < -1e-12 ? a + 2 * Math.PI : Math.max(a, 0))).sort((a, b) => a - b)
    for (let k = 0; k < n; k++) {
      expect(Math.abs(angles[k] - (2 * Math.PI * k) / n)).toBeLessThan(1e-12)
      expect(Math.abs(Math.hypot(ev.re[k], ev.im[k]) - 1)).toBeLessThan(1e-12)
    }
  })

  it('returns the diagonal of a triangular matrix', () => {
    const n = 6
    const re = new Float64Array(n * n)
    const im = new Float64Array(n * n)
    for (let i = 0; i < n; i++) {
      for (let j = i; j < n; j++) {
        re[i * n + j] = i === j ? i + 1 : 0.5
        im[i * n + j] = i === j ? -i : 0.25
      }
    }
    const ev = hessenbergEigenvalues({ n, re, im })
    const got = Array.from(ev.re, (x, k) => [x, ev.im[k]]).sort((a, b) => a[0] - b[0])
    got.forEach(([x, y], i) => {
      expect(x).toBeCloseTo(i + 1, 12)
      expect(y).toBeCloseTo(-i, 12)
    })
  })

  it('keeps tr H and tr H² on random complex Hessenberg matrices (similarity invariants)', () => {
    const rng = createRng('hess')
    const n = 80
    const re = new Float64Array(n * n)
    const im = new Float64Array(n * n)
    for (let i = 0; i < n; i++) {
      for (let j = Math.max(0, i - 1); j < n; j++) {
        re[i * n + j] = rng.normal()
        im[i * n + j] = rng.normal()
      }
    }
    const ev = hessenbergEigenvalues({ n, re, im })
    let t1r = 0
    let t1i = 0
    let t2r = 0
    let t2i = 0
    for (let i = 0; i < n; i++) {
      t1r += re[i * n + i]
      t1i += im[i * n + i]
      for (let k = Math.max(0, i - 1); k <= Math.min(n - 1, i + 1); k++) {
        const ar = re[i * n + k]
        const ai = im[i * n + k]
        const br = re[k * n + i]
        const bi = im[k * n + i]
        t2r += ar * br - ai * bi
        t2i += ar * bi + ai * br
      }
    }
    let e1r = 0
    let e1i = 0
    let e2r = 0
    let e2i = 0
    for (let k = 0; k < n; k++) {
      e1r += ev.re[k]
      e1i += ev.im[k]
      e2r += ev.re[k] ** 2 - ev.im[k] ** 2
      e2i += 2 * ev.re[k] * ev.im[k]
    }
    expect(Math.abs(e1r - t1r) + Math.abs(e1i - t1i)).toBeLessThan(1e-10)
    expect(Math.abs(e2r - t2r) + Math.abs(e2i - t2i)).toBeLessThan(1e-9)
  })
})

describe('Householder reduction to Hessenberg form', () => {
  it('keeps the eigenvalues: A = S D S⁻¹ with S unit upper triangular has the eigenvalues D', () => {
    // similarity by a unit triangular S (inverse by back substitution) — known spectrum by construction
    const n = 7
    const rng = createRng('similar')
    const Dre = Array.from({ length: n }, (_, k) => k - 3)
    const Dim = Array.from({ length: n }, (_, k) => 0.5 * k)
    // S = I + strictly upper U, S⁻¹ computed column by column; then A = S D S⁻¹, then P A Pᵀ with a permutation
    const S: Array<Array<[number, number]>> = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? [1, 0] : j > i ? [0.5 * rng.normal(), 0.5 * rng.normal()] : [0, 0])))
    const Sinv: Array<Array<[number, number]>> = Array.from({ length: n }, () => Array.from({ length: n }, () => [0, 0] as [number, number]))
    for (let j = 0; j < n; j++) {
      for (let i = n - 1; i >= 0; i--) {
        let r = i === j ? 1 : 0
        let m = 0
        for (let k = i + 1; k < n; k++) {
          r -= S[i][k][0] * Sinv[k][j][0] - S[i][k][1] * Sinv[k][j][1]
          m -= S[i][k][0] * Sinv[k][j][1] + S[i][k][1] * Sinv[k][j][0]
        }
        Sinv[i][j] = [r, m]
      }
    }
    const perm = [3, 0, 6, 1, 5, 2, 4]
    const re = new Float64Array(n * n)
    const im = new Float64Array(n * n)
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let r = 0
        let m = 0
        for (let k = 0; k < n; k++) {
          // S_ik D_k Sinv_kj
          const aR = S[i][k][0] * Dre[k] - S[i][k][1] * Dim[k]
          const aI = S[i][k][0] * Dim[k] + S[i][k][1] * Dre[k]
          r += aR * Sinv[k][j][0] - aI * Sinv[k][j][1]
          m += aR * Sinv[k][j][1] + aI * Sinv[k][j][0]
        }
        re[perm[i] * n + perm[j]] = r
        im[perm[i] * n + perm[j]] = m
      }
    }
    const h = reduceToHessenberg({ n, re, im })
    for (let i = 2; i < n; i++) for (let j = 0; j < i - 1; j++) expect(h.re[i * n + j] === 0 && h.im[i * n + j] === 0).toBe(true)
    const ev = complexEigenvalues({ n, re, im })
    const got = Array.from(ev.re, (x, k) => [x, ev.im[k]]).sort((a, b) => a[0] - b[0])
    got.forEach(([x, y], k) => {
      expect(Math.abs(x - Dre[k])).toBeLessThan(1e-10)
      expect(Math.abs(y - Dim[k])).toBeLessThan(1e-10)
    })
  })

  it('keeps the Frobenius norm (unitary similarity)', () => {
    const rng = createRng('frob')
    const n = 30
    const re = Float64Array.from({ length: n * n }, () => rng.normal())
    const im = Float64Array.from({ length: n * n }, () => rng.normal())
    const h = reduceToHessenberg({ n, re, im })
    const fro = (a: Float64Array, b: Float64Array): number => a.reduce((s, x, k) => s + x * x + b[k] * b[k], 0)
    expect(Math.abs(fro(h.re, h.im) - fro(re, im)) / fro(re, im)).toBeLessThan(1e-13)
  })
})
