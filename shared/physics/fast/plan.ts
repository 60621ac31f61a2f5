// How a pair sum is routed to the direct kernels: which kernel code, coordinate dimension and exponent.
//   log   g = −log|x| = −½ log|x|²           (d = 1, 2, 3 and the sphere, chordal distances)
//   power g = |x|^(−s), s = d − 2 for coulomb  (Borodachov, Hardin & Saff, Discrete Energy on
//         Rectifiable Sets, 2019, ch. 2)
import type { Geometry, Kernel } from '../types'
import { EngineInputError } from '../errors'
import { assertKernel } from '../kernels'

export interface PairPlan {
  /** Coordinates per point (3 on the sphere). */
  readonly d: number
  readonly kind: 'log' | 'power'
  /** The exponent s of |x|^(−s) (power kernels only; 0 for log). */
  readonly s: number
  /** 1: s = 1, 2: s = 2, 0: any other s (power kernels). */
  readonly mode: number
}

/** Checks the points (finite numbers, length a multiple of d) and the kernel, and returns the plan. */
export function planPairSum(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry): PairPlan {
  if (geometry.kind === 'torus') throw new EngineInputError('torus energies need the periodic Green function (torus/ewald); the free-space pair sum does not apply on a torus')
  const dim = geometry.kind === 'sphere' ? 3 : geometry.d
  if (d !== dim) throw new EngineInputError(`the points have ${d} coordinates but this geometry needs ${dim}`)
  if (points.length % d !== 0) throw new EngineInputError(`the coordinate array has ${points.length} numbers, not a multiple of d = ${d}`)
  for (let k = 0; k < points.length; k++) {
    if (!Number.isFinite(points[k])) {
      const index = Math.floor(k / d)
      throw new EngineInputError(`point ${index} has a coordinate that is not a finite number (coordinate ${k % d}: ${points[k]})`, { index })
    }
  }
  if (geometry.kind === 'sphere') {
    if (kernel.name === 'coulomb') return { d: 3, kind: 'power', s: 1, mode: 1 }
  }
  else {
    try {
      assertKernel(kernel, d)
    }
    catch (e) {
      throw new EngineInputError(e instanceof Error ? e.message : String(e))
    }
  }
  if (kernel.name === 'log') return { d, kind: 'log', s: 0, mode: 0 }
  const s = kernel.name === 'coulomb' ? d - 2 : kernel.s
  if (!(s > 0 && Number.isFinite(s))) throw new EngineInputError(`the riesz exponent s must be a finite number > 0 (got ${s})`)
  return { d, kind: 'power', s, mode: s === 1 ? 1 : s === 2 ? 2 : 0 }
}
