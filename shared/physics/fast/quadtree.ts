// Adaptive trees over points in R^d (d = 2: quadtree, d = 3: octree) for the fast summation
// methods: a cube is split into its 2^d children until it holds at most `leafSize` points, empty
// children are dropped (so clustered points get deep, narrow branches), and every node keeps its
// centre (the cube's centre), half-width and tight radius max_j |x_j − centre|. The dual traversal
// pairs nodes A, B as far when (r_A + r_B) ≤ θ·|c_A − c_B| and otherwise opens the larger one
// (cell–cell interactions: Dehnen, J. Comput. Phys. 179, 2002; the adaptive quadtree of Carrier,
// Greengard & Rokhlin, SIAM J. Sci. Stat. Comput. 9, 1988).
import { EngineInputError } from '../errors'

export interface PointTree {
  readonly d: number
  /** Points reordered so that every node holds a contiguous range. */
  readonly sorted: Float64Array
  /** sorted point k is input point perm[k]. */
  readonly perm: Int32Array
  readonly start: number[]
  readonly end: number[]
  /** Cube centres, d numbers per node. */
  readonly centre: number[]
  readonly half: number[]
  readonly radius: number[]
  /** Child node indices (empty for a leaf). */
  readonly children: number[][]
  readonly parent: number[]
}

/** Builds the tree; the root is node 0. */
export function buildTree(points: Float64Array, d: number, leafSize: number): PointTree {
  if (!Number.isInteger(leafSize) || leafSize < 1) throw new EngineInputError(`the leaf size must be an integer ≥ 1 (got ${leafSize})`)
  const N = points.length / d
  const perm = new Int32Array(N)
  for (let i = 0; i < N; i++) perm[i] = i
  const lo = new Array<number>(d).fill(Infinity)
  const hi = new Array<number>(d).fill(-Infinity)
  for (let i = 0; i < N; i++) {
    for (let k = 0; k < d; k++) {
      lo[k] = Math.min(lo[k], points[i * d + k])
      hi[k] = Math.max(hi[k], points[i * d + k])
    }
  }
  let h = 0
  const c0: number[] = []
  for (let k = 0; k < d; k++) {
    c0.push(N > 0 ? (lo[k] + hi[k]) / 2 : 0)
    h = Math.max(h, N > 0 ? (hi[k] - lo[k]) / 2 : 0)
  }
  h = h > 0 ? h * (1 + 1e-12) : 1
  // the coordinates are kept in tree order as the points are split (contiguous reads per node)
  const xs = Float64Array.from(points)
  const tree: PointTree = { d, sorted: xs, perm, start: [], end: [], centre: [], half: [], radius: [], children: [], parent: [] }
  const scratch = new Int32Array(N)
  const scratchX = new Float64Array(N * d)
  const codes = new Uint8Array(N)
  const nodeOf = (s: number, e: number, c: number[], half: number, parent: number): number => {
    const id = tree.start.length
    tree.start.push(s)
    tree.end.push(e)
    for (let k = 0; k < d; k++) tree.centre.push(c[k])
    tree.half.push(half)
    tree.children.push([])
    tree.parent.push(parent)
    let r2 = 0
    for (let m = s * d; m < e * d; m += d) {
      let q = 0
      for (let k = 0; k < d; k++) {
        const t = xs[m + k] - c[k]
        q += t * t
      }
      if (q > r2) r2 = q
    }
    tree.radius.push(Math.sqrt(r2))
    return id
  }
  const split = (id: number, depth: number): void => {
    const s = tree.start[id]
    const e = tree.end[id]
    if (e - s <= leafSize || depth >= 52) return
    const c = tree.centre.slice(id * d, id * d + d)
    const nc = 1 << d
    const counts = new Int32Array(nc)
    for (let m = s; m < e; m++) {
      let code = 0
      for (let k = 0; k < d; k++) {
        if (xs[m * d + k] >= c[k]) code |= 1 << k
      }
      codes[m] = code
      counts[code]++
    }
    const offs = new Int32Array(nc + 1)
    for (let q = 0; q < nc; q++) offs[q + 1] = offs[q] + counts[q]
    const fill = offs.slice(0, nc)
    for (let m = s; m < e; m++) {
      const to = s + fill[codes[m]]++
      scratch[to] = perm[m]
      for (let k = 0; k < d; k++) scratchX[to * d + k] = xs[m * d + k]
    }
    perm.set(scratch.subarray(s, e), s)
    xs.set(scratchX.subarray(s * d, e * d), s * d)
    const hh = tree.half[id] / 2
    for (let q = 0; q < nc; q++) {
      if (counts[q] === 0) continue
      const cc: number[] = []
      for (let k = 0; k < d; k++) cc.push(c[k] + ((q >> k) & 1 ? hh : -hh))
      const child = nodeOf(s + offs[q], s + offs[q + 1], cc, hh, id)
      tree.children[id].push(child)
    }
    for (const child of tree.children[id]) split(child, depth + 1)
  }
  nodeOf(0, N, c0, h, -1)
  split(0, 0)
  return tree
}

export interface InteractionLists {
  /** Far node pairs (a, b), a ≠ b, each unordered pair once. */
  readonly farA: number[]
  readonly farB: number[]
  /** (r_a + r_b)/|c_a − c_b| of each far pair. */
  readonly farRatio: number[]
  /** Near leaf pairs (a, b), a ≤ b (a = b: the pairs inside one leaf). */
  readonly nearA: number[]
  readonly nearB: number[]
}

/** The dual traversal with opening parameter θ (0 < θ < 1). */
export function interactionLists(tree: PointTree, theta: number): InteractionLists {
  const lists: InteractionLists = { farA: [], farB: [], farRatio: [], nearA: [], nearB: [] }
  const { d, centre, radius, children } = tree
  const pair = (a: number, b: number): void => {
    let D2 = 0
    for (let k = 0; k < d; k++) {
      const t = centre[a * d + k] - centre[b * d + k]
      D2 += t * t
    }
    const D = Math.sqrt(D2)
    const rs = radius[a] + radius[b]
    if (rs <= theta * D) {
      lists.farA.push(a)
      lists.farB.push(b)
      lists.farRatio.push(rs / D)
      return
    }
    const la = children[a].length === 0
    const lb = children[b].length === 0
    if (la && lb) {
      lists.nearA.push(Math.min(a, b))
      lists.nearB.push(Math.max(a, b))
      return
    }
    if (lb || (!la && radius[a] >= radius[b])) {
      for (const c of children[a]) pair(c, b)
    }
    else {
      for (const c of children[b]) pair(a, c)
    }
  }
  const self = (a: number): void => {
    const ch = children[a]
    if (ch.length === 0) {
      lists.nearA.push(a)
      lists.nearB.push(a)
      return
    }
    for (let x = 0; x < ch.length; x++) {
      self(ch[x])
      for (let y = x + 1; y < ch.length; y++) pair(ch[x], ch[y])
    }
  }
  if (tree.start.length > 0 && tree.end[0] > 0) self(0)
  return lists
}
