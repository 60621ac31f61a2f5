// A uniform cell list (bucket grid) for neighbour searches among N points in d = 1, 2, 3, in free
// space (bounding box) or on the periodic box [0, L)^d with minimum-image distances
//   δ = x − y − L·round((x − y)/L)   in every coordinate.
// The cells have side h; all points within distance r of x lie in the cells whose index differs from
// x's by at most ⌈r/h⌉ in every coordinate (Allen & Tildesley, Computer Simulation of Liquids, 1987,
// §5.3.2, "cell structures and linked lists"; common practice).
import { EngineInputError } from '../errors'

export interface CellList {
  readonly d: number
  readonly N: number
  readonly points: Float64Array
  /** Box side for a torus, undefined in free space. */
  readonly L?: number
  readonly origin: Float64Array
  readonly h: number
  readonly counts: Int32Array
  /** Points sorted by cell: cellStart[c] … cellStart[c + 1] − 1 index into `order`. */
  readonly cellStart: Int32Array
  readonly order: Int32Array
}

function cellsPerSide(list: { counts: Int32Array }, k: number): number {
  return list.counts[k]
}

/** Builds a cell list with cells of side at least `minSide` (default: about one point per cell). */
export function buildCellList(points: Float64Array, d: number, L?: number, minSide?: number): CellList {
  const N = points.length / d
  if (!Number.isInteger(N)) throw new EngineInputError(`cell list: ${points.length} coordinates are not a whole number of points of dimension ${d}`)
  const origin = new Float64Array(d)
  const extent = new Float64Array(d)
  if (L !== undefined) {
    if (!(L > 0) || !Number.isFinite(L)) throw new EngineInputError(`cell list: the box side L must be a finite number > 0 (got ${L})`)
    extent.fill(L)
  }
  else {
    for (let k = 0; k < d; k++) {
      let lo = Infinity
      let hi = -Infinity
      for (let i = 0; i < N; i++) {
        lo = Math.min(lo, points[i * d + k])
        hi = Math.max(hi, points[i * d + k])
      }
      if (N === 0) {
        lo = 0
        hi = 1
      }
      origin[k] = lo
      extent[k] = Math.max(hi - lo, 1e-300)
    }
  }
  let volume = 1
  for (let k = 0; k < d; k++) volume *= extent[k]
  let h = Math.pow(volume / Math.max(N, 1), 1 / d)
  if (minSide !== undefined) h = Math.max(h, minSide)
  let maxSide = 0
  for (let k = 0; k < d; k++) maxSide = Math.max(maxSide, extent[k])
  h = Math.max(h, maxSide / 256) // at most 256 cells per side
  const counts = new Int32Array(d)
  // free space: cells of side exactly h covering the bounding box (the last may reach past it)
  for (let k = 0; k < d; k++) counts[k] = Math.max(1, Math.ceil(extent[k] / h))
  if (L !== undefined) {
    // periodic: cells must tile the box exactly; side L / counts ≥ h
    for (let k = 0; k < d; k++) counts[k] = Math.max(1, Math.floor(L / h))
  }
  let total = 1
  for (let k = 0; k < d; k++) total *= counts[k]
  const cellOf = new Int32Array(N)
  const start = new Int32Array(total + 1)
  const side = L !== undefined ? L / counts[0] : h
  for (let i = 0; i < N; i++) {
    let c = 0
    for (let k = d - 1; k >= 0; k--) {
      let x = points[i * d + k] - origin[k]
      if (L !== undefined) x -= L * Math.floor(x / L)
      const idx = Math.min(counts[k] - 1, Math.max(0, Math.floor(x / (L !== undefined ? L / counts[k] : h))))
      c = c * counts[k] + idx
    }
    cellOf[i] = c
    start[c + 1]++
  }
  for (let c = 0; c < total; c++) start[c + 1] += start[c]
  const fill = start.slice(0, total)
  const order = new Int32Array(N)
  for (let i = 0; i < N; i++) order[fill[cellOf[i]]++] = i
  return { d, N, points, L, origin, h: side, counts, cellStart: start, order }
}

/** Squared (minimum-image) distance between points i and j. */
export function distance2(list: CellList, i: number, j: number): number {
  const { d, points, L } = list
  let s = 0
  for (let k = 0; k < d; k++) {
    let dx = points[i * d + k] - points[j * d + k]
    if (L !== undefined) dx -= L * Math.round(dx / L)
    s += dx * dx
  }
  return s
}

/** Squared (minimum-image) distance between point i and an arbitrary location y. */
export function distance2To(list: CellList, i: number, y: ArrayLike<number>): number {
  const { d, points, L } = list
  let s = 0
  for (let k = 0; k < d; k++) {
    let dx = points[i * d + k] - y[k]
    if (L !== undefined) dx -= L * Math.round(dx / L)
    s += dx * dx
  }
  return s
}

function cellIndexOf(list: CellList, y: ArrayLike<number>, out: Int32Array): void {
  const { d, L, origin } = list
  for (let k = 0; k < d; k++) {
    const n = cellsPerSide(list, k)
    const side = L !== undefined ? L / n : list.h
    let x = y[k] - origin[k]
    if (L !== undefined) x -= L * Math.floor(x / L)
    out[k] = Math.floor(x / side)
    if (L !== undefined) out[k] = Math.min(n - 1, Math.max(0, out[k]))
    else if (out[k] === n && x <= n * side * (1 + 1e-15)) out[k] = n - 1 // the upper edge of the box
  }
}

/**
 * Calls visit(j) once for every point j whose cell lies within `reach` cells of the location y
 * in every coordinate (Chebyshev ring `ring` only, when given). On a torus cells wrap and each
 * cell is visited once even when the reach exceeds half the grid. Returns false when the ring lies
 * entirely outside the grid (free space) or beyond the wrapped grid (torus).
 */
export function visitCells(list: CellList, y: ArrayLike<number>, reach: number, visit: (j: number) => void, ring?: number): boolean {
  const { d, L } = list
  const base = new Int32Array(d)
  cellIndexOf(list, y, base)
  const lo = new Int32Array(d)
  const hi = new Int32Array(d)
  let any = false
  for (let k = 0; k < d; k++) {
    const n = cellsPerSide(list, k)
    if (L !== undefined) {
      const half = Math.floor((n - 1) / 2)
      const up = n - 1 - half
      lo[k] = base[k] - Math.min(reach, half)
      hi[k] = base[k] + Math.min(reach, up)
    }
    else {
      lo[k] = Math.max(0, base[k] - reach)
      hi[k] = Math.min(n - 1, base[k] + reach)
    }
    if (lo[k] > hi[k]) return false
  }
  const idx = new Int32Array(d)
  for (let k = 0; k < d; k++) idx[k] = lo[k]
  for (;;) {
    let cheb = 0
    let c = 0
    for (let k = d - 1; k >= 0; k--) {
      cheb = Math.max(cheb, Math.abs(idx[k] - base[k]))
      const n = cellsPerSide(list, k)
      const wrapped = ((idx[k] % n) + n) % n
      c = c * n + wrapped
    }
    if (ring === undefined || cheb === ring) {
      any = true
      for (let p = list.cellStart[c]; p < list.cellStart[c + 1]; p++) visit(list.order[p])
    }
    let k = 0
    while (k < d) {
      idx[k]++
      if (idx[k] <= hi[k]) break
      idx[k] = lo[k]
      k++
    }
    if (k === d) break
  }
  return any
}

/** Calls visit(j, r) for every point j ≠ i within (minimum-image) distance rmax of point i. */
export function forEachNeighbour(list: CellList, i: number, rmax: number, visit: (j: number, r: number) => void): void {
  const { d, points } = list
  const reach = Math.ceil(rmax / list.h)
  const y = points.subarray(i * d, i * d + d)
  const r2max = rmax * rmax
  visitCells(list, y, reach, (j) => {
    if (j === i) return
    const r2 = distance2(list, i, j)
    if (r2 <= r2max) visit(j, Math.sqrt(r2))
  })
}

/** Number of points within (minimum-image) distance r of the location y (closed ball). */
export function countWithin(list: CellList, y: ArrayLike<number>, r: number): number {
  const reach = Math.ceil(r / list.h)
  const r2 = r * r
  let n = 0
  visitCells(list, y, reach, (j) => {
    if (distance2To(list, j, y) <= r2) n++
  })
  return n
}
