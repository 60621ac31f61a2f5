// Exact samples of the two-dimensional one-component plasma at β = 2 with V(x) = |x|², in the
// canonical convention (H = Σ_{i≠j} −log|x_i − x_j| + N Σ|x_i|², weight e^{−βH/2} = e^{−H}).
// The eigenvalues z of an N×N matrix G of independent standard complex Gaussians (E|G_ij|² = 1) have
// the density ∝ Π_{i<j}|z_i − z_j|² e^{−Σ|z_i|²} (Ginibre, J. Math. Phys. 6 (1965) 440); for w = z/√N
// this is Π_{i<j}|w_i − w_j|² e^{−N Σ|w_i|²} = e^{−H(w)}: the canonical plasma at β = 2, whose
// equilibrium measure is the uniform law on the unit disk (the circular law; Saff & Totik, Logarithmic
// Potentials with External Fields, 1997, ch. IV; Forrester, Log-gases and Random Matrices, 2010, ch. 1).
//
// Hessenberg model. Reduce G to upper-Hessenberg form by Householder reflections, column by column
// (Golub & Van Loan, Matrix Computations, 4th ed., §7.4). The first reflection maps the N − 1
// entries of column 1 below the diagonal to (‖v‖, 0, …, 0) (a reflection followed by a unitary phase); it acts on rows 2…N from the left and on
// columns 2…N from the right, and because the law of a matrix of independent complex Gaussians is
// invariant under unitary maps and the reflection depends only on column 1, the entries it produces
// outside column 1 are again independent standard complex Gaussians, independent of ‖v‖. Repeating
// (the argument Trotter, Adv. Math. 54 (1984) 67, and Dumitriu & Edelman, J. Math. Phys. 43 (2002),
// use for Hermitian matrices): G is unitarily similar to the Hessenberg matrix with independent entries
//   H_ij (j ≥ i) standard complex Gaussian,   H_{k+1,k} = √Gamma(N − k, 1) = χ_{2(N−k)}/√2  (k = 1 … N−1),
// since ‖v‖² is a sum of N − k independent Exp(1) variables. Its eigenvalues are found by the complex
// QR algorithm (linalg/hessenberg.ts) in O(N³) operations with O(N²) random numbers. The model 'full'
// draws the whole matrix and reduces it by Householder reflections instead (a slower cross-check).
import type { Rng } from '../random'
import { EngineInputError } from '../errors'
import { CANONICAL_CONVENTION } from '../conventions'
import { ENGINE_VERSION } from '../version'
import { complexEigenvalues, hessenbergEigenvalues } from '../linalg/hessenberg'
import type { ComplexEigenvalues } from '../linalg/hessenberg'
import type { ExactSample } from './beta-ensembles'

export type GinibreModel = 'hessenberg' | 'full'

/** Eigenvalues of one draw of the N×N complex Ginibre matrix with E|G_ij|² = 1 (unscaled). */
export function ginibreEigenvalues(N: number, rng: Rng, model: GinibreModel = 'hessenberg'): ComplexEigenvalues {
  if (!Number.isInteger(N) || N < 1) throw new EngineInputError(`the number of points N must be an integer ≥ 1 (got ${N})`)
  const re = new Float64Array(N * N)
  const im = new Float64Array(N * N)
  if (model === 'full') {
    for (let k = 0; k < N * N; k++) {
      re[k] = rng.normal() * Math.SQRT1_2
      im[k] = rng.normal() * Math.SQRT1_2
    }
    return complexEigenvalues({ n: N, re, im })
  }
  if (model !== 'hessenberg') throw new EngineInputError(`the Ginibre model must be hessenberg or full (got ${String(model)})`)
  for (let i = 0; i < N; i++) {
    if (i > 0) re[i * N + i - 1] = Math.sqrt(rng.gamma(N - i))
    for (let j = i; j < N; j++) {
      re[i * N + j] = rng.normal() * Math.SQRT1_2
      im[i * N + j] = rng.normal() * Math.SQRT1_2
    }
  }
  return hessenbergEigenvalues({ n: N, re, im })
}

/** Exact sample of the canonical 2-D plasma at β = 2 with V = |x|²: the Ginibre eigenvalues divided by √N. */
export function sampleGinibre(options: { readonly N: number, readonly model?: GinibreModel }, rng: Rng): ExactSample {
  const { N } = options
  const ev = ginibreEigenvalues(N, rng, options.model)
  const scale = 1 / Math.sqrt(N)
  const eigenvalues = new Float64Array(2 * N)
  const points = new Float64Array(2 * N)
  for (let k = 0; k < N; k++) {
    eigenvalues[2 * k] = ev.re[k]
    eigenvalues[2 * k + 1] = ev.im[k]
    points[2 * k] = ev.re[k] * scale
    points[2 * k + 1] = ev.im[k] * scale
  }
  return {
    kind: 'ginibre',
    configuration: { N, d: 2, points },
    eigenvalues,
    scale,
    beta: 2,
    potential: { text: 'r^2', parameters: {} },
    convention: CANONICAL_CONVENTION,
    engineVersion: ENGINE_VERSION,
  }
}
