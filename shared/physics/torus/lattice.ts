// Lattices Λ = {n₁b₁ + … + n_d b_d : n ∈ Z^d} of periods of a torus R^d/Λ (d = 2, 3), their
// cell volume |Λ| = |det B| and dual vectors b*_j with b_i · b*_j = δ_ij, so that the
// reciprocal lattice is 2π Λ* (common practice; e.g. Ashcroft & Mermin, Solid State Physics,
// 1976, ch. 5).
import { EngineInputError } from '../errors'

export interface Lattice {
  readonly d: 2 | 3
  /** Basis vectors stored row by row: b₁ = basis[0..d), b₂ = basis[d..2d), … */
  readonly basis: Float64Array
}

/** The square or cubic lattice LZ^d (the torus [0, L)^d). */
export function cubicLattice(d: 2 | 3, L: number): Lattice {
  if (!(L > 0 && Number.isFinite(L))) throw new EngineInputError(`the side L of the periodic cell must be a finite number > 0 (got ${L})`)
  const basis = new Float64Array(d * d)
  for (let i = 0; i < d; i++) basis[i * d + i] = L
  return { d, basis }
}

/** The triangular lattice of cell area `area`: b₁ = s(1, 0), b₂ = s(1/2, √3/2), s² √3/2 = area. */
export function triangularLattice(area = 1): Lattice {
  if (!(area > 0 && Number.isFinite(area))) throw new EngineInputError(`the cell area must be a finite number > 0 (got ${area})`)
  const s = Math.sqrt((2 * area) / Math.sqrt(3))
  return { d: 2, basis: Float64Array.from([s, 0, 0.5 * s, (Math.sqrt(3) / 2) * s]) }
}

/** Cell volume |det B|. */
export function cellVolume(lattice: Lattice): number {
  const b = lattice.basis
  if (lattice.d === 2) return Math.abs(b[0] * b[3] - b[1] * b[2])
  return Math.abs(
    b[0] * (b[4] * b[8] - b[5] * b[7]) - b[1] * (b[3] * b[8] - b[5] * b[6]) + b[2] * (b[3] * b[7] - b[4] * b[6]),
  )
}

/** Dual basis (rows b*_j) with b_i · b*_j = δ_ij, i.e. (B^{-1})^T. */
export function dualBasis(lattice: Lattice): Float64Array {
  const b = lattice.basis
  const d = lattice.d
  const out = new Float64Array(d * d)
  if (d === 2) {
    const det = b[0] * b[3] - b[1] * b[2]
    out[0] = b[3] / det
    out[1] = -b[2] / det
    out[2] = -b[1] / det
    out[3] = b[0] / det
    return out
  }
  // rows of the dual basis: b*_1 = (b₂ × b₃)/det, b*_2 = (b₃ × b₁)/det, b*_3 = (b₁ × b₂)/det
  const det = b[0] * (b[4] * b[8] - b[5] * b[7]) - b[1] * (b[3] * b[8] - b[5] * b[6]) + b[2] * (b[3] * b[7] - b[4] * b[6])
  const cross = (i: number, j: number, k: number): void => {
    const u = i * 3
    const v = j * 3
    out[k * 3] = (b[u + 1] * b[v + 2] - b[u + 2] * b[v + 1]) / det
    out[k * 3 + 1] = (b[u + 2] * b[v] - b[u] * b[v + 2]) / det
    out[k * 3 + 2] = (b[u] * b[v + 1] - b[u + 1] * b[v]) / det
  }
  cross(1, 2, 0)
  cross(2, 0, 1)
  cross(0, 1, 2)
  return out
}

/** Checks that a lattice has d = 2 or 3, finite entries and a non-degenerate cell. */
export function assertLattice(lattice: Lattice): void {
  if (lattice.d !== 2 && lattice.d !== 3) throw new EngineInputError(`the periodic cell must be 2- or 3-dimensional (got d = ${String(lattice.d)})`)
  if (lattice.basis.length !== lattice.d * lattice.d) throw new EngineInputError(`the lattice basis needs ${lattice.d * lattice.d} numbers (got ${lattice.basis.length})`)
  for (let i = 0; i < lattice.basis.length; i++) {
    if (!Number.isFinite(lattice.basis[i])) throw new EngineInputError(`lattice basis entry ${i} is not a finite number`)
  }
  const v = cellVolume(lattice)
  if (!(v > 0)) throw new EngineInputError('the lattice basis vectors are linearly dependent (cell volume 0)')
}
