// Choosing the equilibrium measure μ_V of a kernel and a potential (Saff & Totik, Logarithmic Potentials
// with External Fields, 1997, ch. I): closed forms for
// V = a|x|² (closed-forms.ts), the uniform measure on the sphere and the torus, and numerical solvers
// registered by other modules for everything else.
import type { Geometry, Kernel } from '../types'
import type { Potential } from '../potentials/types'
import type { EquilibriumMeasure } from './types'
import { EngineInputError } from '../errors'
import {
  rieszBallMeasure,
  semicircleMeasure,
  sphereUniformMeasure,
  torusUniformMeasure,
  uniformBallMeasure,
  uniformDiskMeasure,
} from './closed-forms'

export type { EquilibriumMeasure, Support } from './types'
export {
  rieszBallMeasure,
  semicircleMeasure,
  sphereUniformMeasure,
  torusUniformMeasure,
  uniformBallMeasure,
  uniformDiskMeasure,
} from './closed-forms'

export interface EquilibriumRequest {
  /** Dimension of the points (3 on the sphere). */
  readonly d: number
  readonly kernel: Kernel
  readonly potential?: Potential
  readonly geometry: Geometry
}

/** A numerical solver: returns a measure for the requests it can handle, undefined otherwise. */
export type NumericalSolver = (request: EquilibriumRequest) => EquilibriumMeasure | undefined

const solvers: NumericalSolver[] = []

/** Adds a numerical solver consulted (in registration order) when no closed form applies.
 *  Returns a function that removes it again. */
export function registerNumericalSolver(fn: NumericalSolver): () => void {
  solvers.push(fn)
  return () => {
    const k = solvers.indexOf(fn)
    if (k >= 0) solvers.splice(k, 1)
  }
}

/** The closed form for the request, or undefined when there is none. */
export function closedFormMeasure(request: EquilibriumRequest): EquilibriumMeasure | undefined {
  const { d, kernel, potential, geometry } = request
  if (geometry.kind === 'sphere') return sphereUniformMeasure(kernel)
  if (geometry.kind === 'torus') return torusUniformMeasure(geometry.d, geometry.L, kernel)
  if (potential?.preset?.name !== 'quadratic') return undefined
  const a = potential.preset.a
  if (d === 1 && kernel.name === 'log') return semicircleMeasure(a)
  if (d === 2 && kernel.name === 'log') return uniformDiskMeasure(a)
  if (d === 3 && kernel.name === 'coulomb') return uniformBallMeasure(a)
  if (kernel.name === 'riesz' && (d === 1 || d === 2 || d === 3)) {
    if (d === 3 && kernel.s === 1) return uniformBallMeasure(a, kernel)
    if (kernel.s > Math.max(0, d - 2) && kernel.s < d) return rieszBallMeasure(d, kernel.s, a)
  }
  return undefined
}

/** μ_V for a kernel, a potential and a geometry: a closed form when one applies, else the first
 *  registered numerical solver that accepts the request; an EngineInputError otherwise. */
export function equilibriumMeasure(request: EquilibriumRequest): EquilibriumMeasure {
  const { d, kernel, potential, geometry } = request
  if (geometry.kind === 'free') {
    if (geometry.d !== d) throw new EngineInputError(`the geometry is R^${geometry.d} but the points have dimension ${d}`)
    if (potential === undefined) throw new EngineInputError('free space needs a confining potential V to define the equilibrium measure')
    if (potential.d !== d) throw new EngineInputError(`the potential takes points of dimension ${potential.d} but the points have dimension ${d}`)
  }
  if (geometry.kind === 'sphere' && potential !== undefined) throw new EngineInputError('the sphere carries no external potential; leave the potential out')
  const closed = closedFormMeasure(request)
  if (closed) return closed
  for (const solver of solvers) {
    const measure = solver(request)
    if (measure) return measure
  }
  const what = potential?.preset ? `${potential.preset.name} potential` : `potential ${potential?.text ?? '(none)'}`
  throw new EngineInputError(`no closed form for the equilibrium measure of the ${kernel.name} kernel with the ${what} in d = ${d}; numerical solver needed`)
}
