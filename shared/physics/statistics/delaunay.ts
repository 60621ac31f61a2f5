// Delaunay neighbours and Voronoi cells of planar points (delaunator: Delaunay triangulation by a sweep-
// hull algorithm). The Voronoi cell of an interior point is the polygon of the circumcentres of the
// triangles around it, taken in order (Okabe, Boots, Sugihara & Chiu, Spatial Tessellations, 2nd ed.
// 2000, §2.2); a point of the convex hull has an unbounded cell. On the periodic box [0, L)² the points
// are padded with their images within a margin of the box before triangulating, so that the cells and
// neighbours of the original points are those of the periodic pattern (common practice).
import Delaunator from 'delaunator'
import { EngineInputError } from '../errors'

export interface PlanarTessellation {
  /** Number of original points. */
  readonly N: number
  /** Delaunay neighbours of each original point (indices of original points; repeated on a small torus). */
  readonly neighbours: number[][]
  /** Displacement vectors (dx, dy) to each neighbour, matching `neighbours`. */
  readonly displacements: number[][]
  /** Voronoi cell area of each original point (NaN when unbounded). */
  readonly areas: Float64Array
  /** Voronoi cell vertices (flat x, y) of each original point (empty when unbounded). */
  readonly cells: Float64Array[]
  /** 1 for the points of the convex hull, whose cells are unbounded (free space only). */
  readonly onHull: Uint8Array
}

function circumcentre(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): [number, number] {
  const dx = bx - ax
  const dy = by - ay
  const ex = cx - ax
  const ey = cy - ay
  const bl = dx * dx + dy * dy
  const cl = ex * ex + ey * ey
  const den = 2 * (dx * ey - dy * ex)
  return [ax + (ey * bl - dy * cl) / den, ay + (dx * cl - ex * bl) / den]
}

/** Delaunay neighbours and Voronoi cells, in free space (L undefined) or on the periodic box [0, L)². */
export function tessellate(points: Float64Array, L?: number): PlanarTessellation {
  const N = points.length / 2
  if (!Number.isInteger(N)) throw new EngineInputError(`tessellation: ${points.length} coordinates are not a whole number of planar points`)
  if (N < 3) throw new EngineInputError(`tessellation: at least three points are needed (got ${N})`)
  let coords: Float64Array
  let origin: Int32Array
  if (L !== undefined) {
    const margin = Math.min(L, 4 * L / Math.sqrt(N) + L * 0.05)
    const xs: number[] = []
    const orig: number[] = []
    for (let i = 0; i < N; i++) {
      const x = points[2 * i] - L * Math.floor(points[2 * i] / L)
      const y = points[2 * i + 1] - L * Math.floor(points[2 * i + 1] / L)
      xs.push(x, y)
      orig.push(i)
    }
    for (let sx = -1; sx <= 1; sx++) {
      for (let sy = -1; sy <= 1; sy++) {
        if (sx === 0 && sy === 0) continue
        for (let i = 0; i < N; i++) {
          const x = xs[2 * i] + sx * L
          const y = xs[2 * i + 1] + sy * L
          if (x >= -margin && x <= L + margin && y >= -margin && y <= L + margin) {
            xs.push(x, y)
            orig.push(i)
          }
        }
      }
    }
    coords = Float64Array.from(xs)
    origin = Int32Array.from(orig)
  }
  else {
    coords = Float64Array.from(points)
    origin = Int32Array.from({ length: N }, (_, i) => i)
  }
  const del = new Delaunator(coords)
  const { triangles, halfedges, hull } = del
  if (triangles.length === 0) throw new EngineInputError('tessellation: all points lie on one line')
  const total = coords.length / 2
  // one incoming half-edge per point, a hull one when the point is on the hull
  const incoming = new Int32Array(total).fill(-1)
  for (let e = 0; e < triangles.length; e++) {
    const end = triangles[e % 3 === 2 ? e - 2 : e + 1]
    if (incoming[end] === -1 || halfedges[e] === -1) incoming[end] = e
  }
  const onHullAll = new Uint8Array(total)
  for (const p of hull) onHullAll[p] = 1
  const onHull = new Uint8Array(N)
  const neighbours: number[][] = []
  const displacements: number[][] = []
  const areas = new Float64Array(N).fill(Number.NaN)
  const cells: Float64Array[] = []
  for (let p = 0; p < N; p++) {
    const nb: number[] = []
    const disp: number[] = []
    const verts: number[] = []
    const e0 = incoming[p]
    if (e0 === -1) {
      // a duplicate point is skipped by the triangulation
      throw new EngineInputError(`tessellation: point ${p} coincides with another point`, { index: p })
    }
    let hullPoint = onHullAll[p] === 1
    let e = e0
    let lastOut = -1
    do {
      const q = triangles[e]
      nb.push(origin[q])
      disp.push(coords[2 * q] - coords[2 * p], coords[2 * q + 1] - coords[2 * p + 1])
      const t = Math.floor(e / 3)
      const a = triangles[3 * t]
      const b = triangles[3 * t + 1]
      const c = triangles[3 * t + 2]
      verts.push(...circumcentre(coords[2 * a], coords[2 * a + 1], coords[2 * b], coords[2 * b + 1], coords[2 * c], coords[2 * c + 1]))
      lastOut = e % 3 === 2 ? e - 2 : e + 1
      e = halfedges[lastOut]
    } while (e !== -1 && e !== e0)
    if (e === -1) {
      // the walk reached the hull: the outgoing hull edge p → q ends at the last neighbour
      const q = triangles[lastOut % 3 === 2 ? lastOut - 2 : lastOut + 1]
      nb.push(origin[q])
      disp.push(coords[2 * q] - coords[2 * p], coords[2 * q + 1] - coords[2 * p + 1])
    }
    // a point on a hull edge that the hull list leaves out (collinear boundary points), or one next to a
    // flat triangle, also has an unbounded cell
    if (e === -1 || verts.some(v => !Number.isFinite(v))) hullPoint = true
    onHull[p] = hullPoint ? 1 : 0
    if (hullPoint) {
      cells.push(new Float64Array(0))
    }
    else {
      let a2 = 0
      const V = verts.length / 2
      for (let k = 0; k < V; k++) {
        const k1 = (k + 1) % V
        a2 += verts[2 * k] * verts[2 * k1 + 1] - verts[2 * k1] * verts[2 * k + 1]
      }
      areas[p] = Math.abs(a2) / 2
      cells.push(Float64Array.from(verts))
    }
    neighbours.push(nb)
    displacements.push(disp)
  }
  return { N, neighbours, displacements, areas, cells, onHull }
}
