// Summaries of one configuration for upload screens: bounding box, smallest pair distance with the
// pair attaining it, and the format-independent checksum; and a deterministic preview subsample.
// The closest pair is found with a k-d tree (Bentley, "Multidimensional binary search trees used
// for associative searching", CACM 18(9), 1975; Friedman, Bentley & Finkel, ACM TOMS 3(3), 1977:
// nearest neighbours in logarithmic expected time), so the whole search takes O(N log N) expected
// time instead of the N(N − 1)/2 distances of a direct search. On the torus [0, L)^d the distance
// is the minimum-image distance min over s ∈ {−1, 0, 1}^d of |x − y + sL|, which is the periodic
// distance for points inside the cell (common practice for periodic boxes; Allen & Tildesley,
// "Computer Simulation of Liquids", 1987, §1.5.2).
import type { Configuration } from '../types'
import { configurationChecksum } from './hash'

export interface ConfigurationSummary {
  N: number
  d: number
  /** Coordinate-wise minimum and maximum over the points (empty arrays when N = 0). */
  bbox: { min: number[], max: number[] }
  /** Smallest distance between two distinct points (Euclidean, or minimum-image on the torus); null when N < 2. */
  minDistance: number | null
  /** Indices i < j of a pair at distance minDistance; null when N < 2. */
  minPair: [number, number] | null
  /** SHA-256 of the configuration's canonical bytes (see hash.ts). */
  checksum: string
}

export interface SummaryOptions {
  /** Side L of the periodic cell [0, L)^d: distances become minimum-image distances. */
  period?: number
}

const LEAF_SIZE = 8

/** An implicit k-d tree over the points: node k covers order[start[k], end[k]) with box lo/hi. */
interface KdTree {
  order: Uint32Array
  start: number[]
  end: number[]
  left: number[]
  right: number[]
  lo: Float64Array[]
  hi: Float64Array[]
}

function buildTree(points: Float64Array, N: number, d: number): KdTree {
  const order = new Uint32Array(N)
  for (let i = 0; i < N; i++) order[i] = i
  const tree: KdTree = { order, start: [], end: [], left: [], right: [], lo: [], hi: [] }
  const build = (a: number, b: number): number => {
    const lo = new Float64Array(d).fill(Infinity)
    const hi = new Float64Array(d).fill(-Infinity)
    for (let r = a; r < b; r++) {
      const o = order[r] * d
      for (let k = 0; k < d; k++) {
        const x = points[o + k]
        if (x < lo[k]) lo[k] = x
        if (x > hi[k]) hi[k] = x
      }
    }
    const node = tree.start.length
    tree.start.push(a)
    tree.end.push(b)
    tree.left.push(-1)
    tree.right.push(-1)
    tree.lo.push(lo)
    tree.hi.push(hi)
    let axis = 0
    for (let k = 1; k < d; k++) if (hi[k] - lo[k] > hi[axis] - lo[axis]) axis = k
    // A node whose points all coincide (zero extent) stays a leaf: any pair in it is at distance 0.
    if (b - a <= LEAF_SIZE || !(hi[axis] > lo[axis])) return node
    order.subarray(a, b).sort((u, v) => points[u * d + axis] - points[v * d + axis] || u - v)
    const mid = (a + b) >>> 1
    tree.left[node] = build(a, mid)
    tree.right[node] = build(mid, b)
    return node
  }
  build(0, N)
  return tree
}

/** Squared distance from q to the box [lo, hi] (0 inside it). */
function boxDistance2(q: Float64Array, lo: Float64Array, hi: Float64Array, d: number): number {
  let s = 0
  for (let k = 0; k < d; k++) {
    const x = q[k]
    const t = x < lo[k] ? lo[k] - x : x > hi[k] ? x - hi[k] : 0
    s += t * t
  }
  return s
}

/** Smallest pair distance (squared) and a pair attaining it, by one pruned tree search per point. */
function closestPair(points: Float64Array, N: number, d: number, period: number | undefined): { d2: number, i: number, j: number } {
  const tree = buildTree(points, N, d)
  const { order } = tree
  let best2 = Infinity
  let bi = -1
  let bj = -1
  const q = new Float64Array(d)
  const shift = new Int8Array(d)
  const stack: number[] = []
  const images = period === undefined ? 1 : 3 ** d
  for (let i = 0; i < N && best2 > 0; i++) {
    for (let image = 0; image < images; image++) {
      let rest = image
      for (let k = 0; k < d; k++) {
        // image 0 is the point itself (shift 0 in every coordinate), then shifts of ±L.
        const s = rest % 3
        rest = (rest - s) / 3
        shift[k] = s === 0 ? 0 : s === 1 ? 1 : -1
        q[k] = points[i * d + k] + (period === undefined ? 0 : shift[k] * period)
      }
      stack.length = 0
      stack.push(0)
      while (stack.length > 0) {
        const node = stack.pop() as number
        if (boxDistance2(q, tree.lo[node], tree.hi[node], d) >= best2) continue
        const l = tree.left[node]
        if (l < 0) {
          for (let r = tree.start[node]; r < tree.end[node]; r++) {
            const j = order[r]
            if (j <= i) continue
            const s2 = squaredDistance(points, d, i, j, period)
            if (s2 < best2) {
              best2 = s2
              bi = i
              bj = j
            }
          }
        }
        else {
          stack.push(tree.right[node], l)
        }
      }
    }
  }
  return { d2: best2, i: bi, j: bj }
}

/** Squared distance of points i and j; with a period, each coordinate difference t is replaced by the smallest of |t|, |t − L|, |t + L|. */
function squaredDistance(points: Float64Array, d: number, i: number, j: number, period: number | undefined): number {
  let s2 = 0
  for (let k = 0; k < d; k++) {
    let t = Math.abs(points[i * d + k] - points[j * d + k])
    if (period !== undefined) t = Math.min(t, Math.abs(t - period))
    s2 += t * t
  }
  return s2
}

/** Distance between points i and j of the configuration, as summariseConfiguration measures it. */
export function pairDistance(c: Configuration, i: number, j: number, options: SummaryOptions = {}): number {
  return Math.sqrt(squaredDistance(c.points, c.d, i, j, options.period))
}

/** N, d, bounding box, closest pair and checksum of one configuration (coordinates must be finite). */
export async function summariseConfiguration(c: Configuration, options: SummaryOptions = {}): Promise<ConfigurationSummary> {
  const { N, d, points } = c
  if (options.period !== undefined && !(Number.isFinite(options.period) && options.period > 0)) {
    throw new RangeError(`summariseConfiguration: the period must be a finite number > 0 (got ${options.period})`)
  }
  const min: number[] = []
  const max: number[] = []
  if (N > 0) {
    for (let k = 0; k < d; k++) {
      let lo = Infinity
      let hi = -Infinity
      for (let i = 0; i < N; i++) {
        const x = points[i * d + k]
        if (x < lo) lo = x
        if (x > hi) hi = x
      }
      min.push(lo)
      max.push(hi)
    }
  }
  let minDistance: number | null = null
  let minPair: [number, number] | null = null
  if (N >= 2) {
    const found = closestPair(points, N, d, options.period)
    minPair = [found.i, found.j]
    minDistance = Math.sqrt(found.d2)
  }
  return { N, d, bbox: { min, max }, minDistance, minPair, checksum: await configurationChecksum(c) }
}

/** Every k-th point, k = ⌈N / max⌉, starting with point 0: at most `max` points, as [x, y, …] rows. */
export function previewPoints(c: Configuration, max = 2000): number[][] {
  if (!(Number.isInteger(max) && max >= 1)) throw new RangeError(`previewPoints: max must be an integer ≥ 1 (got ${max})`)
  const { N, d, points } = c
  const step = Math.max(1, Math.ceil(N / max))
  const out: number[][] = []
  for (let i = 0; i < N; i += step) out.push(Array.from(points.subarray(i * d, (i + 1) * d)))
  return out
}
