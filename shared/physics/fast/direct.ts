// Direct (O(N²)) potentials and forces in plain TypeScript, the reference for the fast methods:
//   φ_i = Σ_{j≠i} g(x_i − x_j),  F_i = −∇_{x_i} Σ_{j≠i} g(x_i − x_j),
//   −log|x|: F = Σ (x_i − x_j)/|x_i − x_j|²;  |x|^(−s): φ = Σ r^(−s), F = s Σ (x_i − x_j)/r^(s+2).
// Each sum is compensated (Neumaier 1974; Higham, Accuracy and Stability of Numerical Algorithms, §4.3).
import type { Kernel } from '../types'
import { EngineInputError } from '../errors'
import { CompensatedSum } from '../summation'

export interface PointFields {
  /** φ_i, one per point. */
  readonly potential: Float64Array
  /** F_i, d numbers per point. */
  readonly force: Float64Array
}

/** Direct potentials and forces for the log kernel or |x|^(−s) (coulomb: s = d − 2) in R^d. */
export function directFields(points: Float64Array, d: number, kernel: Kernel): PointFields {
  const N = points.length / d
  const s = kernel.name === 'log' ? 0 : kernel.name === 'coulomb' ? d - 2 : kernel.s
  const potential = new Float64Array(N)
  const force = new Float64Array(N * d)
  const diff = new Float64Array(d)
  for (let i = 0; i < N; i++) {
    const phi = new CompensatedSum()
    const f: CompensatedSum[] = []
    for (let k = 0; k < d; k++) f.push(new CompensatedSum())
    for (let j = 0; j < N; j++) {
      if (j === i) continue
      let r2 = 0
      for (let k = 0; k < d; k++) {
        diff[k] = points[i * d + k] - points[j * d + k]
        r2 += diff[k] * diff[k]
      }
      if (r2 === 0) throw new EngineInputError(`points ${Math.min(i, j)} and ${Math.max(i, j)} coincide; the interaction energy is infinite`, { indices: [Math.min(i, j), Math.max(i, j)] })
      if (kernel.name === 'log') {
        phi.add(-0.5 * Math.log(r2))
        for (let k = 0; k < d; k++) f[k].add(diff[k] / r2)
      }
      else {
        const g = Math.pow(r2, -s / 2)
        phi.add(g)
        for (let k = 0; k < d; k++) f[k].add((s * g * diff[k]) / r2)
      }
    }
    potential[i] = phi.value
    for (let k = 0; k < d; k++) force[i * d + k] = f[k].value
  }
  return { potential, force }
}
