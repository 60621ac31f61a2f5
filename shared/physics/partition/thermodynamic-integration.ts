// Thermodynamic integration of the free energy in β. With the canonical weight e^{−βH/2},
//   d log Z/dβ = −½ E_β[H],   so   log Z(β₁) − log Z(β₀) = −½ ∫_{β₀}^{β₁} E_β[H] dβ
// (Frenkel & Smit, Understanding Molecular Simulation, 2nd ed. 2002, §7.1.1). The integral is taken by
// composite Gauss–Legendre quadrature (Abramowitz & Stegun 1964, 25.4.29) in β or in t = log β
// (dβ = β dt, which smooths the 1/β growth of E_β[H] at small β). Independent estimates with standard
// errors σ_i at the nodes give the propagated standard error ½ (Σ_i w_i² σ_i²)^{1/2} (w_i the weights
// including the Jacobian); the quadrature error itself is estimated by halving the number of nodes
// when `estimateQuadratureError` is set (extra evaluations of meanEnergy).
import { EngineInputError } from '../errors'
import { gaussLegendreOn } from '../quadrature'
import { CompensatedSum } from '../summation'
import { ENGINE_VERSION } from '../version'

export interface MeanEnergyEstimate {
  readonly mean: number
  /** Standard error of the mean (0 for exact values). */
  readonly stderr: number
}

export interface ThermodynamicIntegrationOptions {
  /** Gauss–Legendre nodes per panel (default 12). */
  readonly nodes?: number
  /** Number of equal panels (default 1). */
  readonly panels?: number
  /** Integration variable (default 'beta'). */
  readonly variable?: 'beta' | 'log-beta'
  /** Also evaluate with half the nodes and report the difference (default false). */
  readonly estimateQuadratureError?: boolean
}

export interface ThermodynamicIntegrationResult {
  /** log Z(β₁) − log Z(β₀). */
  readonly difference: number
  /** Propagated statistical standard error. */
  readonly error: number
  /** |difference − the same with half the nodes|, when requested. */
  readonly quadratureError?: number
  readonly beta0: number
  readonly beta1: number
  readonly variable: 'beta' | 'log-beta'
  readonly points: Array<{ beta: number, weight: number, mean: number, stderr: number }>
  readonly engineVersion: string
}

function rule(beta0: number, beta1: number, nodes: number, panels: number, variable: 'beta' | 'log-beta'): Array<{ beta: number, weight: number }> {
  const lo = variable === 'beta' ? beta0 : Math.log(beta0)
  const hi = variable === 'beta' ? beta1 : Math.log(beta1)
  const out: Array<{ beta: number, weight: number }> = []
  for (let p = 0; p < panels; p++) {
    const a = lo + ((hi - lo) * p) / panels
    const b = lo + ((hi - lo) * (p + 1)) / panels
    const g = gaussLegendreOn(nodes, a, b)
    for (let i = 0; i < nodes; i++) {
      const t = g.nodes[i]
      out.push(variable === 'beta' ? { beta: t, weight: g.weights[i] } : { beta: Math.exp(t), weight: g.weights[i] * Math.exp(t) })
    }
  }
  return out
}

function integrate(points: Array<{ beta: number, weight: number }>, meanEnergy: (beta: number) => MeanEnergyEstimate): { value: number, variance: number, rows: Array<{ beta: number, weight: number, mean: number, stderr: number }> } {
  const acc = new CompensatedSum()
  let variance = 0
  const rows = points.map(({ beta, weight }, i) => {
    const e = meanEnergy(beta)
    if (!Number.isFinite(e.mean)) throw new EngineInputError(`thermodynamic integration: the mean energy at β = ${beta} (node ${i}) is not finite`, { index: i })
    if (!(e.stderr >= 0) || !Number.isFinite(e.stderr)) throw new EngineInputError(`thermodynamic integration: the standard error at β = ${beta} (node ${i}) must be a finite number ≥ 0 (got ${e.stderr})`, { index: i })
    acc.add(-0.5 * weight * e.mean)
    variance += (0.5 * weight * e.stderr) ** 2
    return { beta, weight, mean: e.mean, stderr: e.stderr }
  })
  return { value: acc.value, variance, rows }
}

/** log Z(β₁) − log Z(β₀) from mean energies at Gauss–Legendre nodes, with a propagated error bar. */
export function thermodynamicIntegration(meanEnergy: (beta: number) => MeanEnergyEstimate, beta0: number, beta1: number, options: ThermodynamicIntegrationOptions = {}): ThermodynamicIntegrationResult {
  const variable = options.variable ?? 'beta'
  for (const [name, b] of [['β₀', beta0], ['β₁', beta1]] as const) {
    if (!Number.isFinite(b) || (variable === 'log-beta' && !(b > 0)) || !(b >= 0)) throw new EngineInputError(`thermodynamic integration: ${name} must be a finite number ${variable === 'log-beta' ? '> 0' : '≥ 0'} (got ${b})`)
  }
  const nodes = options.nodes ?? 12
  const panels = options.panels ?? 1
  if (!Number.isInteger(nodes) || nodes < 1) throw new EngineInputError(`thermodynamic integration: nodes must be an integer ≥ 1 (got ${nodes})`)
  if (!Number.isInteger(panels) || panels < 1) throw new EngineInputError(`thermodynamic integration: panels must be an integer ≥ 1 (got ${panels})`)
  const main = integrate(rule(beta0, beta1, nodes, panels, variable), meanEnergy)
  let quadratureError: number | undefined
  if (options.estimateQuadratureError) {
    if (nodes < 2) throw new EngineInputError('thermodynamic integration: the quadrature error estimate needs at least 2 nodes')
    const half = integrate(rule(beta0, beta1, Math.ceil(nodes / 2), panels, variable), meanEnergy)
    quadratureError = Math.abs(main.value - half.value)
  }
  return {
    difference: main.value,
    error: Math.sqrt(main.variance),
    ...(quadratureError !== undefined ? { quadratureError } : {}),
    beta0,
    beta1,
    variable,
    points: main.rows,
    engineVersion: ENGINE_VERSION,
  }
}
