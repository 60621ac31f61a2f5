// Next-order energy and the splitting of the energy (sources below). With the fluctuation Σδ_{x_i} − Nμ,
//   F_N(X_N, μ) = Σ_{i≠j} g(x_i − x_j) − 2N Σ_i h^μ(x_i) + N² ∬ g dμ dμ,
// and for μ = μ_V the exact identity
//   H_N(X_N) = N² I_V(μ_V) + 2N Σ_i ζ(x_i) + F_N(X_N, μ_V),   ζ = h^μ + V/2 − c_V,
// whose residual is reported as a consistency check. The normalised next-order energy, bounded in N:
//   log kernels: (F_N + (N/d) log N)/N (d = 1 on the line, 2 in the plane and on S²);
//   Coulomb and Riesz |x|^(−s), s < d: F_N / N^(1+s/d) (= N^(2−2/d) for Coulomb, s = d − 2).
// Sources: Sandier & Serfaty, "2D Coulomb gases and the renormalized energy", Ann. Probab. 43 (2015),
// and "1D log gases and the renormalized energy", Probab. Theory Relat. Fields 162 (2015); Petrache & Serfaty,
// "Next order asymptotics and renormalized energy for Riesz interactions", J. Inst. Math. Jussieu 16 (2017).
import type { Configuration, Geometry, Kernel } from './types'
import type { Potential } from './potentials/types'
import type { EquilibriumMeasure } from './equilibrium/types'
import type { EnergyConvention } from './conventions'
import { CANONICAL_CONVENTION } from './conventions'
import { EngineInputError } from './errors'
import { confinement } from './energy'
import { fastEnergy } from './fast/choose'
import type { FastMethod } from './fast/choose'
import { equilibriumMeasure } from './equilibrium/index'
import { CompensatedSum } from './summation'
import { ENGINE_VERSION } from './version'

export interface NextOrderSetting {
  readonly kernel: Kernel
  readonly geometry: Geometry
  readonly potential?: Potential
  /** The measure μ; μ_V of the kernel and potential when left out. */
  readonly measure?: EquilibriumMeasure
  /** Relative error allowed in the pair sum (default 1e−10): a fast method may then replace the
   *  direct sum for large N (fast/choose.ts). */
  readonly tolerance?: number
}

export interface NextOrderResult {
  readonly N: number
  readonly d: number
  /** Σ_{i<j} g(x_i − x_j). */
  readonly pairSum: number
  /** How the pair sum was taken, and the bound of its relative truncation error (0 for direct sums). */
  readonly pairMethod: FastMethod
  readonly pairErrorBound: number
  /** Σ_i V(x_i). */
  readonly confinement: number
  /** Canonical energy Σ_{i≠j} g + N Σ V. */
  readonly H: number
  /** ∬ g dμ dμ. */
  readonly selfEnergy: number
  readonly IV: number
  readonly cV: number
  /** Σ_i h^μ(x_i). */
  readonly hSum: number
  /** Σ_i ζ(x_i). */
  readonly zetaSum: number
  /** F_N(X_N, μ). */
  readonly nextOrder: number
  /** H − (N² I_V + 2N Σ ζ + F_N), and that divided by max(|H|, |N² I_V| + 2N|Σ ζ| + |F_N|). */
  readonly splittingResidual: { readonly absolute: number, readonly relative: number }
  readonly normalisedNextOrder: number
  /** The normalisation used, e.g. "(F_N + (N/2) log N)/N". */
  readonly normalisation: string
  readonly measure: { readonly method: EquilibriumMeasure['method'], readonly source: string, readonly accuracy: number }
  readonly convention: EnergyConvention
  readonly engineVersion: string
}

/** The normalised next-order energy and its label for a kernel and geometry. */
export function normaliseNextOrder(F: number, N: number, kernel: Kernel, geometry: Geometry): { value: number, label: string } {
  const m = geometry.kind === 'sphere' ? 2 : geometry.d
  if (kernel.name === 'log') return { value: (F + (N / m) * Math.log(N)) / N, label: `(F_N + (N/${m}) log N)/N` }
  const s = kernel.name === 'coulomb' ? m - 2 : kernel.s
  if (!(s < m)) throw new EngineInputError(`the next-order normalisation needs s < d (got s = ${s}, d = ${m})`)
  const p = 1 + s / m
  return { value: F / Math.pow(N, p), label: kernel.name === 'coulomb' ? `F_N / N^(2−2/${m})` : `F_N / N^(1+${s}/${m})` }
}

/** F_N, the splitting identity and the normalised next-order energy of one configuration (canonical convention). */
export function nextOrderEnergy(conf: Configuration, setting: NextOrderSetting): NextOrderResult {
  const { kernel, geometry, potential } = setting
  if (geometry.kind === 'torus') throw new EngineInputError('torus energies: use the Ewald summation (torus/ewald) for the next-order energy on a torus')
  if (geometry.kind === 'sphere' && potential !== undefined) throw new EngineInputError('the sphere carries no external potential; leave the potential out')
  const N = conf.N
  if (!(N >= 1)) throw new EngineInputError('the configuration has no points')
  if (conf.points.length !== N * conf.d) throw new EngineInputError(`the configuration declares N = ${N} points of dimension ${conf.d} but holds ${conf.points.length} numbers`)
  const pairs = fastEnergy(conf.points, conf.d, kernel, geometry, { tolerance: setting.tolerance ?? 1e-10 })
  const ps = pairs.value
  const conf0 = potential === undefined ? 0 : confinement(conf, potential)
  const d = conf.d
  const mu = setting.measure ?? equilibriumMeasure({ d, kernel, potential, geometry })
  if (mu.d !== d) throw new EngineInputError(`the measure lives in dimension ${mu.d} but the points have dimension ${d}`)
  const hAcc = new CompensatedSum()
  const zAcc = new CompensatedSum()
  for (let i = 0; i < N; i++) {
    const h = mu.potential(conf.points, i * d)
    const z = mu.zeta(conf.points, i * d)
    if (!Number.isFinite(h) || !Number.isFinite(z)) throw new EngineInputError(`the potential of the measure is not finite at point ${i}`, { index: i })
    hAcc.add(h)
    zAcc.add(z)
  }
  const hSum = hAcc.value
  const zetaSum = zAcc.value
  const F = new CompensatedSum().add(2 * ps).add(-2 * N * hSum).add(N * N * mu.selfEnergy).value
  const H = new CompensatedSum().add(2 * ps).add(N * conf0).value
  const split = new CompensatedSum().add(N * N * mu.IV).add(2 * N * zetaSum).add(F).value
  const absolute = H - split
  const scale = Math.max(Math.abs(H), Math.abs(N * N * mu.IV) + 2 * N * Math.abs(zetaSum) + Math.abs(F))
  const norm = normaliseNextOrder(F, N, kernel, geometry)
  return {
    N,
    d,
    pairSum: ps,
    pairMethod: pairs.method,
    pairErrorBound: pairs.errorBound,
    confinement: conf0,
    H,
    selfEnergy: mu.selfEnergy,
    IV: mu.IV,
    cV: mu.cV,
    hSum,
    zetaSum,
    nextOrder: F,
    splittingResidual: { absolute, relative: scale > 0 ? Math.abs(absolute) / scale : 0 },
    normalisedNextOrder: norm.value,
    normalisation: norm.label,
    measure: { method: mu.method, source: mu.source, accuracy: mu.accuracy },
    convention: CANONICAL_CONVENTION,
    engineVersion: ENGINE_VERSION,
  }
}
