// Balanced blocks of rows for the triangular pair sum Σ_{i<j}: rows [0, a) hold
// P(a) = a(N − 1) − a(a − 1)/2 pairs, and the boundaries a_k solve P(a_k) ≈ k·P(N)/K (rounded to
// multiples of 4 so the SIMD row groups stay aligned). The blocks depend on N only, so any number of
// threads sums the same blocks in the same order (common practice for reproducible parallel sums).
import { CompensatedSum } from '../summation'

/** Pairs with first index in rows [0, a). */
export function pairsBefore(N: number, a: number): number {
  return a * (N - 1) - (a * (a - 1)) / 2
}

/** The number of blocks used for N points: about 32 rows at least per block, at most 64 blocks. */
export function blockCount(N: number): number {
  return Math.max(1, Math.min(64, Math.floor(N / 32)))
}

/** Row boundaries 0 = a_0 < a_1 < … < a_K = N of blocks with nearly equal pair counts. */
export function balancedRowBlocks(N: number, K = blockCount(N)): number[] {
  const total = pairsBefore(N, N)
  const bounds = [0]
  for (let k = 1; k < K; k++) {
    const target = (k * total) / K
    // P(a) = target: a = (2N − 1 − sqrt((2N − 1)² − 8·target)) / 2
    const b = 2 * N - 1
    let a = Math.round((b - Math.sqrt(Math.max(0, b * b - 8 * target))) / 2 / 4) * 4
    a = Math.min(N, Math.max(bounds[bounds.length - 1], a))
    if (a > bounds[bounds.length - 1] && a < N) bounds.push(a)
  }
  bounds.push(N)
  return bounds
}

/** Block sums combined in block order with compensation. */
export function sumInOrder(parts: ArrayLike<number>): number {
  const acc = new CompensatedSum()
  for (let k = 0; k < parts.length; k++) acc.add(parts[k])
  return acc.value
}
