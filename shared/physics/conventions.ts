// Energy conventions. Published papers write the energy of N points with a pair sum counted once
// (½Σ_{i≠j} = Σ_{i<j}) or twice (Σ_{i≠j}), a field term Σ V(x_i) scaled by 1, N/2 or N, a logarithmic
// kernel written as −log|x| or with the opposite overall sign, and a Gibbs weight e^{−βH}, e^{−βH/2}
// or e^{−βN^{2/d−1}H/2}. The engine's canonical record (cf. Forrester, Log-gases and Random Matrices,
// 2010, §1.4) is
//
//   H = Σ_{i≠j} g(x_i − x_j) + N Σ_i V(x_i),   g = −log|x| for log kernels,   weight e^{−βH/2}.
//
// With S = Σ_{i≠j} g (canonical sign), C = Σ_i V(x_i), a record means
//   H_conv = σ (p S + f C),   p = ½ ('half') or 1 ('full'),   f = 1, N/2 or N,
//   σ = +1 ('minus-log') or −1 ('plus-log': the energy is written Σ log|x_i − x_j| − f Σ V, a quantity
//   to maximise, and its weight is e^{+w H_conv}); the Gibbs weight is e^{−σ w H_conv} with
//   w = β, β/2 or β N^{2/d−1}/2. 'plus-log' only has a meaning for the log kernel.
//
// When H alone can be converted: H_to = σ_t σ_f (p_t/p_f) H_from holds only if the field carries the
// same weight relative to the pairs in both records (f_t/p_t = f_f/p_f), e.g. ('half', N/2) and
// ('full', N). Otherwise the two parts S and C are needed separately (give one of them and H, or both),
// unless V = 0 (confinement 0, e.g. on the sphere or the torus) or N = 1 (no pairs); convertEnergy
// throws an EngineInputError saying so. The same condition decides whether a change of β alone keeps
// the Gibbs measure the same (convertBeta); gibbsEquivalent also returns the factor by which V must be
// rescaled when it does not.
import type { Kernel } from './types'
import { EngineInputError } from './errors'
import { kernelLabel } from './kernels'

export type PairCount = 'half' | 'full'
export type FieldScale = 1 | 'N/2' | 'N'
export type LogSign = 'minus-log' | 'plus-log'
export type GibbsScaling = 'beta' | 'beta/2' | 'beta N^(2/d-1)/2'

/** How a stored energy and its Gibbs weight are written. */
export interface EnergyConvention {
  /** 'half': ½Σ_{i≠j} g = Σ_{i<j} g; 'full': Σ_{i≠j} g. */
  readonly pairs: PairCount
  /** The factor in front of Σ_i V(x_i). */
  readonly fieldScale: FieldScale
  /** g = −log|x| ('minus-log') or the whole energy written with the opposite sign ('plus-log'). */
  readonly logSign: LogSign
  /** The Gibbs weight: e^{−βH}, e^{−βH/2} or e^{−βN^{2/d−1}H/2}. */
  readonly gibbs: GibbsScaling
}

/** The engine's canonical convention: H = Σ_{i≠j} g + N Σ V, g = −log|x|, weight e^{−βH/2}. */
export const CANONICAL_CONVENTION: EnergyConvention = Object.freeze({
  pairs: 'full',
  fieldScale: 'N',
  logSign: 'minus-log',
  gibbs: 'beta/2',
})

const PAIRS: readonly PairCount[] = ['half', 'full']
const FIELDS: readonly FieldScale[] = [1, 'N/2', 'N']
const SIGNS: readonly LogSign[] = ['minus-log', 'plus-log']
const GIBBS: readonly GibbsScaling[] = ['beta', 'beta/2', 'beta N^(2/d-1)/2']

/** Every convention record (2 · 3 · 2 · 3 = 36). */
export function allConventions(): EnergyConvention[] {
  const out: EnergyConvention[] = []
  for (const pairs of PAIRS) for (const fieldScale of FIELDS) for (const logSign of SIGNS) for (const gibbs of GIBBS) out.push({ pairs, fieldScale, logSign, gibbs })
  return out
}

function describe(value: unknown): string {
  return typeof value === 'string' ? `'${value}'` : String(value)
}

/** Checks an unknown value (e.g. parsed JSON) and returns it as a convention record, or throws an
 *  EngineInputError naming the offending field. `label` names the value in the message. */
export function validateConvention(value: unknown, label = 'convention'): EnergyConvention {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) throw new EngineInputError(`${label}: expected an object with fields pairs, fieldScale, logSign, gibbs`)
  const v = value as Record<string, unknown>
  for (const key of Object.keys(v)) {
    if (!['pairs', 'fieldScale', 'logSign', 'gibbs'].includes(key)) throw new EngineInputError(`${label}: unknown field '${key}' (expected pairs, fieldScale, logSign, gibbs)`)
  }
  if (!PAIRS.includes(v.pairs as PairCount)) throw new EngineInputError(`${label}.pairs: expected 'half' or 'full' (got ${describe(v.pairs)})`)
  if (!FIELDS.includes(v.fieldScale as FieldScale)) throw new EngineInputError(`${label}.fieldScale: expected 1, 'N/2' or 'N' (got ${describe(v.fieldScale)})`)
  if (!SIGNS.includes(v.logSign as LogSign)) throw new EngineInputError(`${label}.logSign: expected 'minus-log' or 'plus-log' (got ${describe(v.logSign)})`)
  if (!GIBBS.includes(v.gibbs as GibbsScaling)) throw new EngineInputError(`${label}.gibbs: expected 'beta', 'beta/2' or 'beta N^(2/d-1)/2' (got ${describe(v.gibbs)})`)
  return { pairs: v.pairs as PairCount, fieldScale: v.fieldScale as FieldScale, logSign: v.logSign as LogSign, gibbs: v.gibbs as GibbsScaling }
}

/** True when two records are the same convention. */
export function sameConvention(a: EnergyConvention, b: EnergyConvention): boolean {
  return a.pairs === b.pairs && a.fieldScale === b.fieldScale && a.logSign === b.logSign && a.gibbs === b.gibbs
}

function checkN(N: number, d: number): void {
  if (!Number.isInteger(N) || N < 1) throw new EngineInputError(`the number of points N must be an integer ≥ 1 (got ${N})`)
  if (!Number.isInteger(d) || d < 1) throw new EngineInputError(`the dimension d must be an integer ≥ 1 (got ${d})`)
}

/** p: ½ for 'half', 1 for 'full'. */
export function pairFactor(conv: EnergyConvention): number {
  return conv.pairs === 'half' ? 0.5 : 1
}

/** f: 1, N/2 or N. */
export function fieldFactor(conv: EnergyConvention, N: number): number {
  return conv.fieldScale === 1 ? 1 : conv.fieldScale === 'N/2' ? N / 2 : N
}

/** σ = +1 ('minus-log') or −1 ('plus-log'); 'plus-log' with a kernel other than log is an error. */
export function signFactor(conv: EnergyConvention, kernel?: Kernel): number {
  if (conv.logSign === 'minus-log') return 1
  if (kernel !== undefined && kernel.name !== 'log') throw new EngineInputError(`the convention logSign 'plus-log' only applies to the log kernel (the kernel is ${kernel.name})`)
  return -1
}

/** w/β: 1, ½ or N^{2/d−1}/2 (d is the dimension of the points' space: 1, 2, 3, and 2 on the sphere S²). */
export function gibbsFactor(conv: EnergyConvention, N: number, d: number): number {
  if (conv.gibbs === 'beta') return 1
  if (conv.gibbs === 'beta/2') return 0.5
  return Math.pow(N, 2 / d - 1) / 2
}

export interface EnergyParts {
  /** Σ_{i≠j} g(x_i − x_j) in the canonical sign (g = −log|x| for log kernels). */
  readonly pairSumOrdered: number
  /** Σ_i V(x_i). */
  readonly confinement: number
  readonly N: number
  readonly d: number
  /** When given, 'plus-log' is refused for kernels other than log. */
  readonly kernel?: Kernel
}

/** H in the given convention: σ (p Σ_{i≠j} g + f Σ V). */
export function energyInConvention(parts: EnergyParts, conv: EnergyConvention = CANONICAL_CONVENTION): number {
  checkN(parts.N, parts.d)
  const sigma = signFactor(conv, parts.kernel)
  return sigma * (pairFactor(conv) * parts.pairSumOrdered + fieldFactor(conv, parts.N) * parts.confinement)
}

export interface ConversionContext {
  readonly N: number
  readonly d: number
  /** Σ_{i<j} g(x_i − x_j) in the canonical sign — the value `pairSum()` and `energy().pairSum` return. */
  readonly pairSum?: number
  /** Σ_i V(x_i) (0 when there is no external potential). */
  readonly confinement?: number
  readonly kernel?: Kernel
  /** Relative tolerance for the check that H matches both given parts (default 1e-8). */
  readonly tolerance?: number
}

function sameRatio(x: number, y: number): boolean {
  return Math.abs(x - y) <= 1e-15 * Math.max(Math.abs(x), Math.abs(y))
}

/** Converts an energy H written in `from` into `to`. See the header: H alone suffices only when the
 *  field has the same weight relative to the pairs in both records (or N = 1, or confinement 0);
 *  otherwise give pairSum or confinement (or both, which are then checked against H). */
export function convertEnergy(H: number, from: EnergyConvention, to: EnergyConvention, context: ConversionContext): number {
  const { N, d, kernel } = context
  checkN(N, d)
  if (!Number.isFinite(H)) throw new EngineInputError(`convertEnergy: the energy must be a finite number (got ${H})`)
  const sf = signFactor(from, kernel)
  const st = signFactor(to, kernel)
  const pf = pairFactor(from)
  const pt = pairFactor(to)
  const ff = fieldFactor(from, N)
  const ft = fieldFactor(to, N)
  const raw = sf * H // = pf S + ff C
  let S: number | undefined = context.pairSum === undefined ? undefined : 2 * context.pairSum
  let C: number | undefined = context.confinement
  if (N === 1) S = 0
  if (S !== undefined && C !== undefined) {
    const expected = pf * S + ff * C
    const tol = (context.tolerance ?? 1e-8) * Math.max(Math.abs(pf * S) + Math.abs(ff * C), Number.MIN_VALUE)
    if (Math.abs(expected - raw) > tol) {
      throw new EngineInputError(`convertEnergy: H = ${H} does not match its parts (pair sum and confinement give ${sf * expected} in the source convention)`)
    }
  }
  if (S === undefined && C === undefined) {
    if (!sameRatio(ff / pf, ft / pt)) {
      throw new EngineInputError(
        `convertEnergy: the two conventions weight the field differently relative to the pairs (field/pair factor ${ff / pf} versus ${ft / pt} at N = ${N}); `
        + 'H alone cannot be converted — give the pair sum or the confinement Σ V(x_i) (0 when there is no external potential)',
      )
    }
    return st * sf * (pt / pf) * H
  }
  if (S === undefined) S = (raw - ff * (C as number)) / pf
  if (C === undefined) C = (raw - pf * S) / ff
  return st * (pt * S + ft * C)
}

/** The β of `to` that gives the same Gibbs measure as β in `from`, or an EngineInputError when no β
 *  does (the field is weighted differently relative to the pairs; see gibbsEquivalent). */
export function convertBeta(beta: number, from: EnergyConvention, to: EnergyConvention, context: { N: number, d: number }): number {
  const eq = gibbsEquivalent(beta, from, to, context)
  if (!sameRatio(eq.potentialScale, 1)) {
    throw new EngineInputError(
      `convertBeta: no β gives the same Gibbs measure — the conventions weight the field differently relative to the pairs; `
      + `with β = ${eq.beta} the potential must also be multiplied by ${eq.potentialScale} (see gibbsEquivalent)`,
    )
  }
  return eq.beta
}

/** β_to and the factor λ such that e^{−w_to(β_to)(p_to S + f_to λ C)} is the Gibbs weight e^{−w_from(β)(p_from S + f_from C)}
 *  (the exponent is taken with the sign σ, so 'plus-log' does not change β). */
export function gibbsEquivalent(beta: number, from: EnergyConvention, to: EnergyConvention, context: { N: number, d: number }): { beta: number, potentialScale: number } {
  const { N, d } = context
  checkN(N, d)
  if (!(beta > 0) || !Number.isFinite(beta)) throw new EngineInputError(`convertBeta: β must be a finite number > 0 (got ${beta})`)
  const wf = gibbsFactor(from, N, d) * beta
  const betaTo = (wf * pairFactor(from)) / (gibbsFactor(to, N, d) * pairFactor(to))
  const wt = gibbsFactor(to, N, d) * betaTo
  const potentialScale = (wf * fieldFactor(from, N)) / (wt * fieldFactor(to, N))
  return { beta: betaTo, potentialScale }
}

/** A human label, e.g. "Σ_{i≠j} −log|x_i−x_j| + N Σ V(x_i); weight e^{−βH/2}". */
export function conventionLabel(conv: EnergyConvention, kernel: Kernel = { name: 'log' }, d = 2): string {
  const plus = conv.logSign === 'plus-log'
  const pairs = conv.pairs === 'half' ? '½Σ_{i≠j}' : 'Σ_{i≠j}'
  let g: string
  if (kernel.name === 'log') g = plus ? 'log|x_i−x_j|' : '−log|x_i−x_j|'
  else g = kernelLabel(kernel, d).replace(/x/g, 'x_i−x_j')
  const field = conv.fieldScale === 1 ? 'Σ V(x_i)' : conv.fieldScale === 'N/2' ? '(N/2) Σ V(x_i)' : 'N Σ V(x_i)'
  const sign = plus ? '+' : '−'
  const weight = conv.gibbs === 'beta' ? `e^{${sign}βH}` : conv.gibbs === 'beta/2' ? `e^{${sign}βH/2}` : `e^{${sign}βN^{2/d−1}H/2}`
  return `${pairs} ${g} ${plus ? '−' : '+'} ${field}; weight ${weight}`
}
