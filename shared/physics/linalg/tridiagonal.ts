// Eigenvalues of a real symmetric tridiagonal matrix T (diagonal a_0 … a_{n−1}, off-diagonal
// b_0 … b_{n−2}, T_{k,k+1} = T_{k+1,k} = b_k) by the implicit QL algorithm with Wilkinson's shift:
// each sweep chases a bulge up the matrix with Givens rotations, the shift being the eigenvalue of the
// leading 2×2 block closest to its corner; an off-diagonal entry is set to zero once
// |b_m| ≤ ε(|a_m| + |a_{m+1}|). Sources: Golub & Van Loan, Matrix Computations, 4th ed. (2013), §8.3
// (the symmetric QR algorithm and the Wilkinson shift); Bowdler, Martin, Reinsch & Wilkinson, "The QR and QL
// algorithms for symmetric matrices", Numer. Math. 11 (1968) (the tql1 procedure of EISPACK).
// Also the Sturm count: the number of eigenvalues below x equals the number of negative pivots of the
// LDLᵀ factorisation of T − xI (Sylvester's law of inertia; Golub & Van Loan §8.4).
import { EngineInputError } from '../errors'

const EPS = 2.220446049250313e-16

function checkInput(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>): number {
  const n = diagonal.length
  if (n === 0) throw new EngineInputError('the tridiagonal matrix is empty')
  if (offDiagonal.length < n - 1) throw new EngineInputError(`a tridiagonal matrix of size ${n} needs ${n - 1} off-diagonal entries (got ${offDiagonal.length})`)
  for (let k = 0; k < n; k++) if (!Number.isFinite(diagonal[k])) throw new EngineInputError(`diagonal entry ${k} is not a finite number (${diagonal[k]})`, { index: k })
  for (let k = 0; k < n - 1; k++) if (!Number.isFinite(offDiagonal[k])) throw new EngineInputError(`off-diagonal entry ${k} is not a finite number (${offDiagonal[k]})`, { index: k })
  return n
}

/** The eigenvalues of the symmetric tridiagonal matrix, in increasing order. */
export function symmetricTridiagonalEigenvalues(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>): Float64Array {
  const n = checkInput(diagonal, offDiagonal)
  const d = Float64Array.from(diagonal)
  const e = new Float64Array(n)
  for (let k = 0; k < n - 1; k++) e[k] = offDiagonal[k]
  for (let l = 0; l < n; l++) {
    let iterations = 0
    for (;;) {
      let m = l
      for (; m < n - 1; m++) {
        const dd = Math.abs(d[m]) + Math.abs(d[m + 1])
        if (Math.abs(e[m]) <= EPS * dd) break
      }
      if (m === l) break
      if (++iterations > 60) throw new EngineInputError(`the tridiagonal QL iteration did not converge for eigenvalue ${l}`, { index: l })
      // Wilkinson shift from the 2×2 block at l
      let g = (d[l + 1] - d[l]) / (2 * e[l])
      let r = Math.hypot(g, 1)
      g = d[m] - d[l] + e[l] / (g + (g >= 0 ? r : -r))
      let s = 1
      let c = 1
      let p = 0
      let i = m - 1
      let underflow = false
      for (; i >= l; i--) {
        const f = s * e[i]
        const b = c * e[i]
        r = Math.hypot(f, g)
        e[i + 1] = r
        if (r === 0) {
          // the rotation is the identity: the matrix has split; finish this sweep early
          d[i + 1] -= p
          e[m] = 0
          underflow = true
          break
        }
        s = f / r
        c = g / r
        g = d[i + 1] - p
        r = (d[i] - g) * s + 2 * c * b
        p = s * r
        d[i + 1] = g + p
        g = c * r - b
      }
      if (underflow) continue
      d[l] -= p
      e[l] = g
      e[m] = 0
    }
  }
  return d.sort()
}

/** The number of eigenvalues of the symmetric tridiagonal matrix that are < x (Sturm count). */
export function sturmCount(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>, x: number): number {
  const n = checkInput(diagonal, offDiagonal)
  let count = 0
  let q = diagonal[0] - x
  const tiny = EPS * EPS
  for (let k = 0; ; k++) {
    if (q === 0) q = -tiny // a zero pivot is perturbed to a negative one (x counts as above it)
    if (q < 0) count++
    if (k === n - 1) break
    const b = offDiagonal[k]
    q = diagonal[k + 1] - x - (b * b) / q
  }
  return count
}

/** The eigenvalues of BBᵀ for the lower bidiagonal B (diagonal x_0 … x_{n−1}, subdiagonal y_0 … y_{n−2}),
 *  through the tridiagonal matrix BBᵀ: (BBᵀ)_{kk} = x_k² + y_{k−1}², (BBᵀ)_{k,k+1} = x_k y_k. */
export function bidiagonalGramEigenvalues(diagonal: ArrayLike<number>, subDiagonal: ArrayLike<number>): Float64Array {
  const n = checkInput(diagonal, subDiagonal)
  const a = new Float64Array(n)
  const b = new Float64Array(Math.max(0, n - 1))
  for (let k = 0; k < n; k++) {
    const x = diagonal[k]
    const y = k > 0 ? subDiagonal[k - 1] : 0
    a[k] = x * x + y * y
    if (k < n - 1) b[k] = x * subDiagonal[k]
  }
  return symmetricTridiagonalEigenvalues(a, b)
}
