// Fast summation of the 3-D Coulomb energy Σ_{i<j} 1/|x_i − x_j|, potentials and forces. This is a
// Barnes–Hut-style tree code (Barnes & Hut, Nature 324, 1986) with Cartesian multipoles to order p and
// the rigorous error bound of treecode.ts, not the full fast multipole method of Greengard & Rokhlin
// (Acta Numerica 6, 1997): cost O(N log N · p³) instead of O(N p⁴). Per pair the relative error is at
// most (1 + θ) θ^(p+1)/(1 − θ) (Legendre expansion, |P_n| ≤ 1), hence so is that of the energy and
// of every potential (all terms are positive).
import { ENGINE_VERSION } from '../version'
import type { TreecodeEnergyResult, TreecodeFieldsResult, TreecodeOptions } from './treecode'
import { treecodeEnergy, treecodeFields } from './treecode'

export type { TreecodeOptions as Fmm3dOptions } from './treecode'

/** Σ_{i<j} 1/|x_i − x_j| of points in R³ (flat x0, y0, z0, x1, …). */
export function fmm3dEnergy(points: Float64Array, options: TreecodeOptions = {}): TreecodeEnergyResult {
  return { ...treecodeEnergy(points, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, options), engineVersion: ENGINE_VERSION }
}

/** φ_i = Σ_{j≠i} 1/|x_i − x_j| and F_i = Σ_{j≠i} (x_i − x_j)/|x_i − x_j|³. */
export function fmm3dFields(points: Float64Array, options: TreecodeOptions = {}): TreecodeFieldsResult {
  return { ...treecodeFields(points, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, options), engineVersion: ENGINE_VERSION }
}
