// Exact partition functions in the engine's canonical convention:
//   H = Σ_{i≠j} −log|x_i − x_j| + N Σ_i V(x_i),  V(x) = a|x|²,  Z = ∫ e^{−βH/2} dx
//     = ∫ Π_{i<j} |x_i − x_j|^β e^{−(β/2) N a Σ_i |x_i|²} dx.
// Change of variables x = c y with c² = 1/(βNa) turns the weight into e^{−Σ|y_i|²/2}, and
// Π|x_i − x_j|^β = c^{βN(N−1)/2} Π|y_i − y_j|^β, dx = c^{dN} dy, so
//   d = 1 (Gaussian β-ensemble): Z = c^{N + βN(N−1)/2} M_N(β), with Mehta's integral
//     M_N(β) = ∫ Π_{i<j}|y_i − y_j|^β e^{−Σ y_i²/2} dy = (2π)^{N/2} Π_{j=1}^{N} Γ(1 + jβ/2)/Γ(1 + β/2)
//     (Mehta, Random Matrices, 3rd ed. 2004, eq. 17.6.7; Forrester, Log-gases and Random Matrices, 2010, §4.7),
//     log Z = −½ (N + βN(N−1)/2) log(βNa) + log M_N(β);
//   d = 2, β = 2 (Ginibre): with c² = 1/(Na) the weight becomes e^{−Σ|w_i|²} and
//     ∫_{C^N} Π_{i<j}|w_i − w_j|² e^{−Σ|w_i|²} d²w = π^N Π_{k=1}^{N} k!   (Ginibre, J. Math. Phys. 6, 1965;
//     Forrester 2010, §15.1), so log Z = −½ N(N + 1) log(Na) + N log π + Σ_{k=1}^{N} log k!.
// The mean energy follows from d log Z/dβ = −½ E_β[H]:
//   E_β[H] = (N(N−1)/2) log(βNa) + (N + βN(N−1)/2)/β − Σ_{j=1}^{N} (j ψ(1 + jβ/2) − ψ(1 + β/2))   (d = 1).
// Other convention records: the record's Gibbs weight with β' and V = a|x|² equals the canonical weight with
// β = β_can and V scaled by λ (gibbsEquivalent in conventions.ts), so Z_record(β', a) = Z_can(β_can, λa).
import type { EnergyConvention } from '../conventions'
import { CANONICAL_CONVENTION, conventionLabel, gibbsEquivalent } from '../conventions'
import { EngineInputError } from '../errors'
import { CompensatedSum } from '../summation'
import { ENGINE_VERSION } from '../version'
import { digamma, logFactorial, logGamma } from './log-gamma'

function checkN(N: number, what: string): void {
  if (!Number.isInteger(N) || N < 1) throw new EngineInputError(`${what}: N must be an integer ≥ 1 (got ${N})`)
}

function checkPositive(x: number, name: string, what: string): void {
  if (!(x > 0) || !Number.isFinite(x)) throw new EngineInputError(`${what}: ${name} must be a finite number > 0 (got ${x})`)
}

/** log M_N(β), Mehta's integral with the weight e^{−Σ y²/2}. */
export function logMehtaIntegral(N: number, beta: number): number {
  checkN(N, 'Mehta integral')
  checkPositive(beta, 'β', 'Mehta integral')
  const acc = new CompensatedSum()
  acc.add((N / 2) * Math.log(2 * Math.PI))
  const g = logGamma(1 + beta / 2)
  for (let j = 1; j <= N; j++) acc.add(logGamma(1 + (j * beta) / 2) - g)
  return acc.value
}

/** log Z of the Gaussian β-ensemble in the canonical convention, V = a x². */
export function gaussianLogZ(N: number, beta: number, a: number): number {
  checkPositive(a, 'a', 'Gaussian β-ensemble')
  return -0.5 * (N + (beta * N * (N - 1)) / 2) * Math.log(beta * N * a) + logMehtaIntegral(N, beta)
}

/** E_β[H] of the Gaussian β-ensemble (canonical H, V = a x²) = −2 d/dβ log Z. */
export function gaussianMeanEnergy(N: number, beta: number, a: number): number {
  checkN(N, 'Gaussian β-ensemble')
  checkPositive(beta, 'β', 'Gaussian β-ensemble')
  checkPositive(a, 'a', 'Gaussian β-ensemble')
  const acc = new CompensatedSum()
  acc.add(((N * (N - 1)) / 2) * Math.log(beta * N * a))
  acc.add((N + (beta * N * (N - 1)) / 2) / beta)
  const p = digamma(1 + beta / 2)
  for (let j = 1; j <= N; j++) acc.add(-(j * digamma(1 + (j * beta) / 2) - p))
  return acc.value
}

/** log Z of the 2-D plasma at β = 2 in the canonical convention, V = a|x|². */
export function ginibreLogZ(N: number, a: number): number {
  checkN(N, 'Ginibre ensemble')
  checkPositive(a, 'a', 'Ginibre ensemble')
  const acc = new CompensatedSum()
  acc.add(-0.5 * N * (N + 1) * Math.log(N * a))
  acc.add(N * Math.log(Math.PI))
  for (let k = 1; k <= N; k++) acc.add(logFactorial(k))
  return acc.value
}

export interface LogZRequest {
  readonly ensemble: 'gaussian' | 'ginibre'
  readonly N: number
  /** β in the given convention (default: canonical). For 'ginibre' it must correspond to canonical β = 2. */
  readonly beta: number
  /** V(x) = a|x|² (default 1). */
  readonly a?: number
  readonly convention?: EnergyConvention
}

export interface LogZResult {
  readonly logZ: number
  readonly ensemble: 'gaussian' | 'ginibre'
  readonly N: number
  readonly d: 1 | 2
  readonly beta: number
  readonly a: number
  readonly convention: EnergyConvention
  readonly conventionLabel: string
  /** The canonical parameters with the same Gibbs measure. */
  readonly canonical: { readonly beta: number, readonly a: number }
  readonly formula: string
  readonly source: string
  readonly engineVersion: string
}

/** Exact log Z for the Gaussian β-ensemble or the β = 2 plasma, in any convention record. */
export function exactLogZ(request: LogZRequest): LogZResult {
  const { ensemble, N, beta } = request
  const a = request.a ?? 1
  const convention = request.convention ?? CANONICAL_CONVENTION
  const d = ensemble === 'gaussian' ? 1 : 2
  checkN(N, 'log Z')
  checkPositive(a, 'a', 'log Z')
  const eq = gibbsEquivalent(beta, convention, CANONICAL_CONVENTION, { N, d })
  const canonical = { beta: eq.beta, a: a * eq.potentialScale }
  let logZ: number
  let formula: string
  let source: string
  if (ensemble === 'gaussian') {
    logZ = gaussianLogZ(N, canonical.beta, canonical.a)
    formula = 'log Z = −½(N + βN(N−1)/2) log(βNa) + (N/2) log 2π + Σ_j [log Γ(1 + jβ/2) − log Γ(1 + β/2)]'
    source = 'Mehta, Random Matrices, 3rd ed. (2004), eq. 17.6.7'
  }
  else if (ensemble === 'ginibre') {
    if (Math.abs(canonical.beta - 2) > 1e-12) {
      throw new EngineInputError(`log Z: the plasma in the plane has a closed form only at canonical β = 2 (β = ${beta} in this convention is canonical β = ${canonical.beta})`)
    }
    logZ = ginibreLogZ(N, canonical.a)
    formula = 'log Z = −½N(N+1) log(Na) + N log π + Σ_k log k!'
    source = 'Ginibre, J. Math. Phys. 6 (1965) 440; Forrester, Log-gases and Random Matrices (2010), §15.1'
  }
  else {
    throw new EngineInputError(`log Z: unknown ensemble '${String(ensemble)}' (expected 'gaussian' or 'ginibre')`)
  }
  return {
    logZ,
    ensemble,
    N,
    d,
    beta,
    a,
    convention,
    conventionLabel: conventionLabel(convention, { name: 'log' }, d),
    canonical,
    formula,
    source,
    engineVersion: ENGINE_VERSION,
  }
}
