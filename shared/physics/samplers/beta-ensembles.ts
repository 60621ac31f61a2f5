// Exact samplers of the one-dimensional log-gas for any β > 0 (Dumitriu & Edelman, "Matrix models for
// beta ensembles", J. Math. Phys. 43 (2002) 5830–5847).
//
// β-Hermite. H = (1/√2)·T with T symmetric tridiagonal, T_kk ~ N(0, 2), T_{k,k+1} ~ χ_{(N−k)β}
// (k = 1 … N−1), all independent. Its eigenvalues λ have the density ∝ Π_{i<j}|λ_i − λ_j|^β e^{−Σλ_i²/2}.
// In the engine's canonical convention (conventions.ts: H = Σ_{i≠j} −log|x_i − x_j| + N Σ V(x_i),
// weight e^{−βH/2}) the weight is Π_{i<j}|x_i − x_j|^β e^{−(β/2) N Σ V(x_i)}. Put x = λ/√(N c): then
// e^{−Σλ²/2} = e^{−(N c/2) Σ x²}, which is e^{−(β/2) N Σ a x²} exactly when a = c/β. So
//   the points x_i = λ_i / √(β N a) follow the canonical Gibbs measure at β with V(x) = a x²,
// whose equilibrium measure is the semicircle of radius √(2/a) (equilibrium/closed-forms.ts).
//
// β-Laguerre. B lower bidiagonal with B_kk ~ χ_{2α − β(k−1)} (k = 1 … N) and B_{k+1,k} ~ χ_{β(N−k)},
// independent, α > β(N − 1)/2; the eigenvalues of L = BBᵀ have the density
// ∝ Π_{i<j}|λ_i − λ_j|^β Π λ_i^{α−p} e^{−Σλ_i/2} on (0, ∞)^N, p = 1 + β(N − 1)/2.
// With x = λ/(β N) the weight becomes Π_{i<j}|x_i − x_j|^β e^{−(β/2) N Σ V(x_i)} with
//   V(x) = x − (2(α − p)/(β N)) log x  on x > 0 (+∞ for x ≤ 0),
// a potential that depends on N unless α − p grows like N (for α − p = β N γ/2 it is x − γ log x and the
// limit is a Marchenko–Pastur law).
import type { Configuration } from '../types'
import type { Rng } from '../random'
import { EngineInputError } from '../errors'
import { CANONICAL_CONVENTION } from '../conventions'
import type { EnergyConvention } from '../conventions'
import { ENGINE_VERSION } from '../version'
import { bidiagonalGramEigenvalues, symmetricTridiagonalEigenvalues } from '../linalg/tridiagonal'

/** One exact sample with the Gibbs measure it follows. */
export interface ExactSample {
  readonly kind: 'beta-hermite' | 'beta-laguerre' | 'ginibre'
  /** The points in the canonical convention (see `potential`). */
  readonly configuration: Configuration
  /** The eigenvalues before rescaling (for Ginibre: real and imaginary parts, interleaved). */
  readonly eigenvalues: Float64Array
  /** The factor that maps eigenvalues to points: x = eigenvalue · scale. */
  readonly scale: number
  readonly beta: number
  /** The external potential V of the canonical Gibbs measure the points follow, as expression text
   *  (potentials/expression syntax) with its parameters. */
  readonly potential: { readonly text: string, readonly parameters: Readonly<Record<string, number>> }
  readonly convention: EnergyConvention
  readonly engineVersion: string
}

function checkN(N: number): void {
  if (!Number.isInteger(N) || N < 1) throw new EngineInputError(`the number of points N must be an integer ≥ 1 (got ${N})`)
}

function checkBeta(beta: number): void {
  if (!(beta > 0) || !Number.isFinite(beta)) throw new EngineInputError(`β must be a finite number > 0 (got ${beta})`)
}

/** Eigenvalues (increasing) of one draw of the Dumitriu–Edelman β-Hermite matrix (density ∝ Π|Δλ|^β e^{−Σλ²/2}). */
export function betaHermiteEigenvalues(N: number, beta: number, rng: Rng): Float64Array {
  checkN(N)
  checkBeta(beta)
  const diagonal = new Float64Array(N)
  const off = new Float64Array(Math.max(0, N - 1))
  for (let k = 0; k < N; k++) diagonal[k] = rng.normal() // N(0, 2)/√2 = N(0, 1)
  for (let k = 0; k < N - 1; k++) off[k] = rng.chi(beta * (N - 1 - k)) / Math.SQRT2
  return symmetricTridiagonalEigenvalues(diagonal, off)
}

export interface BetaHermiteOptions {
  readonly N: number
  readonly beta: number
  /** The target potential V(x) = a x² (default a = 1: semicircle on [−√2, √2]). */
  readonly a?: number
}

/** Exact sample of the canonical 1-D log-gas with V(x) = a x² at inverse temperature β. */
export function sampleBetaHermite(options: BetaHermiteOptions, rng: Rng): ExactSample {
  const { N, beta } = options
  const a = options.a ?? 1
  if (!(a > 0) || !Number.isFinite(a)) throw new EngineInputError(`the potential coefficient a must be a finite number > 0 (got ${a})`)
  const eigenvalues = betaHermiteEigenvalues(N, beta, rng)
  const scale = 1 / Math.sqrt(beta * N * a)
  const points = eigenvalues.map(v => v * scale)
  return {
    kind: 'beta-hermite',
    configuration: { N, d: 1, points },
    eigenvalues,
    scale,
    beta,
    potential: { text: 'a*x^2', parameters: { a } },
    convention: CANONICAL_CONVENTION,
    engineVersion: ENGINE_VERSION,
  }
}

/** Eigenvalues (increasing) of one draw of the β-Laguerre matrix BBᵀ with parameter α > β(N−1)/2. */
export function betaLaguerreEigenvalues(N: number, beta: number, alpha: number, rng: Rng): Float64Array {
  checkN(N)
  checkBeta(beta)
  if (!(alpha > (beta * (N - 1)) / 2) || !Number.isFinite(alpha)) {
    throw new EngineInputError(`the Laguerre parameter α must exceed β(N − 1)/2 = ${(beta * (N - 1)) / 2} (got ${alpha})`)
  }
  const diagonal = new Float64Array(N)
  const sub = new Float64Array(Math.max(0, N - 1))
  for (let k = 0; k < N; k++) diagonal[k] = rng.chi(2 * alpha - beta * k)
  for (let k = 0; k < N - 1; k++) sub[k] = rng.chi(beta * (N - 1 - k))
  return bidiagonalGramEigenvalues(diagonal, sub)
}

export interface BetaLaguerreOptions {
  readonly N: number
  readonly beta: number
  /** α > β(N − 1)/2 (for β = 1, 2 Wishart matrices with n samples: α = βn/2). */
  readonly alpha: number
}

/** Exact sample of the canonical log-gas on (0, ∞) with V(x) = x − k log x, k = 2(α − p)/(βN). */
export function sampleBetaLaguerre(options: BetaLaguerreOptions, rng: Rng): ExactSample {
  const { N, beta, alpha } = options
  const eigenvalues = betaLaguerreEigenvalues(N, beta, alpha, rng)
  const scale = 1 / (beta * N)
  const points = eigenvalues.map(v => v * scale)
  const p = 1 + (beta * (N - 1)) / 2
  const k = (2 * (alpha - p)) / (beta * N)
  return {
    kind: 'beta-laguerre',
    configuration: { N, d: 1, points },
    eigenvalues,
    scale,
    beta,
    potential: { text: 'x - k*log(x)', parameters: { k } },
    convention: CANONICAL_CONVENTION,
    engineVersion: ENGINE_VERSION,
  }
}
