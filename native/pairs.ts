// Direct pair sums with 128-bit SIMD (two f64 lanes), compiled by AssemblyScript to WebAssembly.
//   energies   Σ_{i0 ≤ i < i1} Σ_{j > i} g(x_i − x_j)  (a block of rows of the triangular i < j sum)
//   log        Σ log|x_i − x_j|² by products of squared distances: the r² values of a lane are multiplied
//              into a running product and one logarithm is taken whenever the product leaves
//              [1e−150, 1e150], so few logarithms are evaluated and nothing over- or underflows
//   power      |x|^(−s) as 1/√r² (s = 1), 1/r² (s = 2), exp(−(s/2)·log r²) otherwise
//   fields     potentials φ_i = Σ_{j≠i} g(x_i − x_j) and forces F_i = −∇_{x_i} Σ_{j≠i} g(x_i − x_j)
//              for −log|x| in the plane and 1/|x| in space
// Sums are compensated (Neumaier, Z. Angew. Math. Mech. 54, 1974; Higham, Accuracy and Stability of
// Numerical Algorithms, 2002, §4.3), per SIMD lane where each pair adds a term of either sign.
// Coordinates are stored per axis (x₀x₁…, y₀y₁…, z₀z₁…) at byte offsets chosen by the host; lower
// dimensions pass axes filled with zeros. A zero distance stops the sum, returns NaN and records the pair.

const LOW: f64 = 1e-150
const HIGH: f64 = 1e150
// squared distances allowed on the fast path: products then stay inside [1e−290, 1e290]
const SAFE_LOW: f64 = 1e-70
const SAFE_HIGH: f64 = 1e70
const SAFE_COORD: f64 = 1e34
const TILE: i32 = 64

let badI: i32 = -1
let badJ: i32 = -1
let accS: f64 = 0
let accC: f64 = 0
// running products of the fast log path, carried from one group of rows to the next and flushed
// (one logarithm per lane) only when they leave [1e−150, 1e150] or at the end of a call
let gp0: v128 = f64x2.splat(1)
let gp1: v128 = f64x2.splat(1)
let gp2: v128 = f64x2.splat(1)
let gp3: v128 = f64x2.splat(1)
let gTail: f64 = 1

/** First free byte after the module's static data. */
export function heapBase(): usize {
  return __heap_base
}

/** The pair (i, j) of coincident points found by the last call, or −1. */
export function coincidentI(): i32 {
  return badI
}

export function coincidentJ(): i32 {
  return badJ
}

@inline function accReset(): void {
  accS = 0
  accC = 0
}

@inline function accAdd(x: f64): void {
  const t = accS + x
  if (Math.abs(accS) >= Math.abs(x)) accC += (accS - t) + x
  else accC += (x - t) + accS
  accS = t
}

@inline function ld(p: usize, i: i32): f64 {
  return load<f64>(p + (<usize>i << 3))
}

@inline function vld(p: usize, i: i32): v128 {
  return v128.load(p + (<usize>i << 3))
}

@inline function r2At(px: usize, py: usize, pz: usize, i: i32, j: i32): f64 {
  const dx = ld(px, i) - ld(px, j)
  const dy = ld(py, i) - ld(py, j)
  const dz = ld(pz, i) - ld(pz, j)
  return dx * dx + dy * dy + dz * dz
}

function flag(i: i32, j: i32): f64 {
  badI = i
  badJ = j
  return NaN
}

// ---------------------------------------------------------------- log energies

/** Careful scalar path for row r against the columns [j0, j1): Σ log r² into the accumulator, by a
 *  running product checked after every factor (a lone factor outside [1e−150, 1e150] is logged by
 *  itself); false, with the pair recorded, at a zero distance. */
function logRowCareful(px: usize, py: usize, pz: usize, r: i32, j0: i32, j1: i32): bool {
  let prod: f64 = 1
  for (let j = j0; j < j1; j++) {
    const r2 = r2At(px, py, pz, r, j)
    if (r2 == 0) {
      flag(r, j)
      return false
    }
    if (r2 < LOW || r2 > HIGH) {
      accAdd(Math.log(r2))
      continue
    }
    prod *= r2
    if (prod < LOW || prod > HIGH) {
      accAdd(Math.log(prod))
      prod = 1
    }
  }
  if (prod != 1) accAdd(Math.log(prod))
  return true
}

/** Careful scalar path for the rows [i0, i1), all j > i. */
function logRowsCareful(px: usize, py: usize, pz: usize, n: i32, i0: i32, i1: i32): bool {
  for (let i = i0; i < i1; i++) {
    if (!logRowCareful(px, py, pz, i, i + 1, n)) return false
  }
  return true
}

@inline function flushLanes(p: v128): void {
  accAdd(Math.log(f64x2.extract_lane(p, 0)))
  accAdd(Math.log(f64x2.extract_lane(p, 1)))
}

@inline function outOfRange(p: v128, lo: v128, hi: v128): v128 {
  return v128.or(f64x2.lt(p, lo), f64x2.gt(p, hi))
}

@inline function rowR2(xr: v128, yr: v128, zr: v128, xj: v128, yj: v128, zj: v128, threeD: bool): v128 {
  const a = f64x2.sub(xr, xj)
  const b = f64x2.sub(yr, yj)
  let r = f64x2.add(f64x2.mul(a, a), f64x2.mul(b, b))
  if (threeD) {
    const c = f64x2.sub(zr, zj)
    r = f64x2.add(r, f64x2.mul(c, c))
  }
  return r
}

/** Four rows i..i+3 against j in [j0, n) (j0 ≥ i+4), SIMD over j, products checked every second
 *  step; false when the careful path is needed (a squared distance below 1e−70). Needs all
 *  coordinates below 1e34 in size, so that every r² < 1e70 and two factors keep a product that was
 *  inside [1e−150, 1e150] inside [1e−290, 1e290]. */
function logFourRows(px: usize, py: usize, pz: usize, n: i32, i: i32, j0: i32, threeD: bool): bool {
  const lo = f64x2.splat(LOW)
  const hi = f64x2.splat(HIGH)
  const one = f64x2.splat(1)
  const x0 = f64x2.splat(ld(px, i))
  const x1 = f64x2.splat(ld(px, i + 1))
  const x2 = f64x2.splat(ld(px, i + 2))
  const x3 = f64x2.splat(ld(px, i + 3))
  const y0 = f64x2.splat(ld(py, i))
  const y1 = f64x2.splat(ld(py, i + 1))
  const y2 = f64x2.splat(ld(py, i + 2))
  const y3 = f64x2.splat(ld(py, i + 3))
  const z0 = f64x2.splat(ld(pz, i))
  const z1 = f64x2.splat(ld(pz, i + 1))
  const z2 = f64x2.splat(ld(pz, i + 2))
  const z3 = f64x2.splat(ld(pz, i + 3))
  let p0 = gp0
  let p1 = gp1
  let p2 = gp2
  let p3 = gp3
  let mn = f64x2.splat(Infinity)
  let j = j0
  for (; j + 3 < n; j += 4) {
    let xj = vld(px, j)
    let yj = vld(py, j)
    let zj = threeD ? vld(pz, j) : one
    let r0 = rowR2(x0, y0, z0, xj, yj, zj, threeD)
    let r1 = rowR2(x1, y1, z1, xj, yj, zj, threeD)
    let r2 = rowR2(x2, y2, z2, xj, yj, zj, threeD)
    let r3 = rowR2(x3, y3, z3, xj, yj, zj, threeD)
    mn = f64x2.pmin(mn, f64x2.pmin(f64x2.pmin(r0, r1), f64x2.pmin(r2, r3)))
    p0 = f64x2.mul(p0, r0)
    p1 = f64x2.mul(p1, r1)
    p2 = f64x2.mul(p2, r2)
    p3 = f64x2.mul(p3, r3)
    xj = vld(px, j + 2)
    yj = vld(py, j + 2)
    zj = threeD ? vld(pz, j + 2) : one
    r0 = rowR2(x0, y0, z0, xj, yj, zj, threeD)
    r1 = rowR2(x1, y1, z1, xj, yj, zj, threeD)
    r2 = rowR2(x2, y2, z2, xj, yj, zj, threeD)
    r3 = rowR2(x3, y3, z3, xj, yj, zj, threeD)
    mn = f64x2.pmin(mn, f64x2.pmin(f64x2.pmin(r0, r1), f64x2.pmin(r2, r3)))
    p0 = f64x2.mul(p0, r0)
    p1 = f64x2.mul(p1, r1)
    p2 = f64x2.mul(p2, r2)
    p3 = f64x2.mul(p3, r3)
    const m = v128.or(v128.or(outOfRange(p0, lo, hi), outOfRange(p1, lo, hi)), v128.or(outOfRange(p2, lo, hi), outOfRange(p3, lo, hi)))
    if (v128.any_true(m)) {
      flushLanes(p0)
      flushLanes(p1)
      flushLanes(p2)
      flushLanes(p3)
      p0 = one
      p1 = one
      p2 = one
      p3 = one
    }
  }
  if (Math.min(f64x2.extract_lane(mn, 0), f64x2.extract_lane(mn, 1)) < SAFE_LOW) return false
  // the last columns when n − j0 is not a multiple of 4, into the scalar running product
  let tail = gTail
  for (; j < n; j++) {
    for (let r = 0; r < 4; r++) {
      const q = r2At(px, py, pz, i + r, j)
      if (q < SAFE_LOW) return false
      tail *= q
      if (tail < LOW || tail > HIGH) {
        accAdd(Math.log(tail))
        tail = 1
      }
    }
  }
  gp0 = p0
  gp1 = p1
  gp2 = p2
  gp3 = p3
  gTail = tail
  return true
}

function productsReset(): void {
  const one = f64x2.splat(1)
  gp0 = one
  gp1 = one
  gp2 = one
  gp3 = one
  gTail = 1
}

/** Adds the logarithms of the carried products to the accumulator and resets them. */
function productsFlush(): void {
  flushLanes(gp0)
  flushLanes(gp1)
  flushLanes(gp2)
  flushLanes(gp3)
  if (gTail != 1) accAdd(Math.log(gTail))
  productsReset()
}

/** logFourRows with the accumulator and the carried products put back as they were when it fails
 *  (the caller then takes the careful path for these rows). */
function fastFourRows(px: usize, py: usize, pz: usize, n: i32, i: i32, j0: i32, threeD: bool): bool {
  const s = accS
  const c = accC
  const q0 = gp0
  const q1 = gp1
  const q2 = gp2
  const q3 = gp3
  const qt = gTail
  if (logFourRows(px, py, pz, n, i, j0, threeD)) return true
  accS = s
  accC = c
  gp0 = q0
  gp1 = q1
  gp2 = q2
  gp3 = q3
  gTail = qt
  return false
}

// the total of a call: the accumulator of each group of rows is added with compensation
let totS: f64 = 0
let totC: f64 = 0

function totalReset(): void {
  totS = 0
  totC = 0
}

function foldGroup(): void {
  const t = totS + accS
  if (Math.abs(totS) >= Math.abs(accS)) totC += (totS - t) + accS
  else totC += (accS - t) + totS
  totS = t
  totC += accC
}

/** The largest coordinate size, to decide whether the fast path is safe. */
function maxAbs(px: usize, py: usize, pz: usize, n: i32): f64 {
  let m: f64 = 0
  for (let k = 0; k < n; k++) {
    m = Math.max(m, Math.max(Math.abs(ld(px, k)), Math.max(Math.abs(ld(py, k)), Math.abs(ld(pz, k)))))
  }
  return m
}

function logRows(px: usize, py: usize, pz: usize, n: i32, i0: i32, i1: i32, threeD: bool): f64 {
  badI = -1
  badJ = -1
  totalReset()
  const fast = maxAbs(px, py, pz, n) < SAFE_COORD
  productsReset()
  let i = i0
  for (; i + 4 <= i1; i += 4) {
    accReset()
    // the small triangle inside the four rows, then the four rows against j ≥ i + 4
    let ok = logRowsCarefulRange(px, py, pz, i, i + 4)
    if (ok && i + 4 < n && !(fast && fastFourRows(px, py, pz, n, i, i + 4, threeD))) ok = logRowsCareful4(px, py, pz, n, i)
    if (!ok) return NaN
    foldGroup()
  }
  accReset()
  productsFlush()
  if (i < i1 && !logRowsCareful(px, py, pz, n, i, i1)) return NaN
  foldGroup()
  return totS + totC
}

/** Pairs i ≤ a < b < i1 inside a group of rows, scalar. */
function logRowsCarefulRange(px: usize, py: usize, pz: usize, i0: i32, i1: i32): bool {
  for (let a = i0; a < i1; a++) {
    for (let b = a + 1; b < i1; b++) {
      const r2 = r2At(px, py, pz, a, b)
      if (r2 == 0) {
        flag(a, b)
        return false
      }
      accAdd(Math.log(r2))
    }
  }
  return true
}

/** Four rows i..i+3 against j ≥ i + 4, scalar careful path. */
function logRowsCareful4(px: usize, py: usize, pz: usize, n: i32, i: i32): bool {
  for (let a = i; a < i + 4; a++) {
    if (!logRowCareful(px, py, pz, a, i + 4, n)) return false
  }
  return true
}

/** Σ_{i0 ≤ i < i1} Σ_{j > i} log|x_i − x_j|² for points in the plane (the line: y = 0). */
export function energyLog2(px: usize, py: usize, pz: usize, n: i32, i0: i32, i1: i32): f64 {
  return logRows(px, py, pz, n, i0, i1, false)
}

/** The same in R³ (and on the sphere: chordal distances). */
export function energyLog3(px: usize, py: usize, pz: usize, n: i32, i0: i32, i1: i32): f64 {
  return logRows(px, py, pz, n, i0, i1, true)
}

// ---------------------------------------------------------------- power-law energies

@inline function powerOf(r2: v128, mode: i32, halfS: f64): v128 {
  if (mode == 1) return f64x2.div(f64x2.splat(1), f64x2.sqrt(r2))
  if (mode == 2) return f64x2.div(f64x2.splat(1), r2)
  const a = Math.exp(-halfS * Math.log(f64x2.extract_lane(r2, 0)))
  const b = Math.exp(-halfS * Math.log(f64x2.extract_lane(r2, 1)))
  return f64x2(a, b)
}

@inline function powerScalar(r2: f64, mode: i32, halfS: f64): f64 {
  if (mode == 1) return 1 / Math.sqrt(r2)
  if (mode == 2) return 1 / r2
  return Math.exp(-halfS * Math.log(r2))
}

/** Σ_{i0 ≤ i < i1} Σ_{j > i} |x_i − x_j|^(−s) in R³ (lower dimensions: zero axes).
 *  mode 1: s = 1, mode 2: s = 2, mode 0: any s > 0. Terms are positive; tiles of 64 columns are
 *  summed per lane and the tile sums combined with compensation. */
export function energyPower(px: usize, py: usize, pz: usize, n: i32, i0: i32, i1: i32, mode: i32, s: f64): f64 {
  badI = -1
  badJ = -1
  accReset()
  const halfS = s / 2
  const zero = f64x2.splat(0)
  for (let i = i0; i < i1; i++) {
    const xi = f64x2.splat(ld(px, i))
    const yi = f64x2.splat(ld(py, i))
    const zi = f64x2.splat(ld(pz, i))
    let j = i + 1
    while (j + 1 < n) {
      const end = min(n - 1, j + TILE)
      let acc = zero
      let mn = f64x2.splat(Infinity)
      for (; j < end; j += 2) {
        const a = f64x2.sub(xi, vld(px, j))
        const b = f64x2.sub(yi, vld(py, j))
        const c = f64x2.sub(zi, vld(pz, j))
        const r2 = f64x2.add(f64x2.add(f64x2.mul(a, a), f64x2.mul(b, b)), f64x2.mul(c, c))
        mn = f64x2.pmin(mn, r2)
        acc = f64x2.add(acc, powerOf(r2, mode, halfS))
      }
      if (f64x2.extract_lane(mn, 0) == 0 || f64x2.extract_lane(mn, 1) == 0) {
        for (let k = i + 1; k < n; k++) {
          if (r2At(px, py, pz, i, k) == 0) return flag(i, k)
        }
      }
      accAdd(f64x2.extract_lane(acc, 0))
      accAdd(f64x2.extract_lane(acc, 1))
    }
    for (; j < n; j++) {
      const r2 = r2At(px, py, pz, i, j)
      if (r2 == 0) return flag(i, j)
      accAdd(powerScalar(r2, mode, halfS))
    }
  }
  return accS + accC
}

// ---------------------------------------------------------------- potentials and forces

@inline function neumaier(s: v128, x: v128, c: v128): v128 {
  // returns the new compensation; the caller sets s ← s + x
  const t = f64x2.add(s, x)
  const big = f64x2.ge(f64x2.abs(s), f64x2.abs(x))
  const e = v128.bitselect(f64x2.add(f64x2.sub(s, t), x), f64x2.add(f64x2.sub(x, t), s), big)
  return f64x2.add(c, e)
}

@inline function lanes(v: v128): f64 {
  return f64x2.extract_lane(v, 0) + f64x2.extract_lane(v, 1)
}

@inline function st(p: usize, i: i32, v: f64): void {
  store<f64>(p + (<usize>i << 3), v)
}

/** For i in [i0, i1): φ_i = Σ_{j≠i} −log|x_i − x_j| and F_i = Σ_{j≠i} (x_i − x_j)/|x_i − x_j|²
 *  in the plane, written at index i of the output arrays. Returns 0, or NaN for coincident points. */
export function fieldLog2(px: usize, py: usize, n: i32, i0: i32, i1: i32, outPhi: usize, outFx: usize, outFy: usize): f64 {
  badI = -1
  badJ = -1
  const one = f64x2.splat(1)
  const lo = f64x2.splat(LOW)
  const hi = f64x2.splat(HIGH)
  for (let i = i0; i < i1; i++) {
    const xi = f64x2.splat(ld(px, i))
    const yi = f64x2.splat(ld(py, i))
    accReset()
    let sx = f64x2.splat(0)
    let cx = sx
    let sy = sx
    let cy = sx
    let prod = one
    let mn = f64x2.splat(Infinity)
    let mx = f64x2.splat(0)
    let j = 0
    for (; j + 1 < n; j += 2) {
      if (j == i || j + 1 == i) continue
      const a = f64x2.sub(xi, vld(px, j))
      const b = f64x2.sub(yi, vld(py, j))
      const r2 = f64x2.add(f64x2.mul(a, a), f64x2.mul(b, b))
      mn = f64x2.pmin(mn, r2)
      mx = f64x2.pmax(mx, r2)
      const inv = f64x2.div(one, r2)
      const fx = f64x2.mul(a, inv)
      const fy = f64x2.mul(b, inv)
      cx = neumaier(sx, fx, cx)
      sx = f64x2.add(sx, fx)
      cy = neumaier(sy, fy, cy)
      sy = f64x2.add(sy, fy)
      prod = f64x2.mul(prod, r2)
      if (v128.any_true(outOfRange(prod, lo, hi))) {
        flushLanes(prod)
        prod = one
      }
    }
    const lmin = Math.min(f64x2.extract_lane(mn, 0), f64x2.extract_lane(mn, 1))
    const lmax = Math.max(f64x2.extract_lane(mx, 0), f64x2.extract_lane(mx, 1))
    let fxs = lanes(sx) + lanes(cx)
    let fys = lanes(sy) + lanes(cy)
    if (lmin < SAFE_LOW || lmax > SAFE_HIGH) {
      // careful scalar path for this row
      accReset()
      let fxS: f64 = 0
      let fxC: f64 = 0
      let fyS: f64 = 0
      let fyC: f64 = 0
      for (let k = 0; k < n; k++) {
        if (k == i) continue
        const a = ld(px, i) - ld(px, k)
        const b = ld(py, i) - ld(py, k)
        const r2 = a * a + b * b
        if (r2 == 0) return flag(min(i, k), max(i, k))
        accAdd(Math.log(r2))
        let t = fxS + a / r2
        fxC += Math.abs(fxS) >= Math.abs(a / r2) ? (fxS - t) + a / r2 : (a / r2 - t) + fxS
        fxS = t
        t = fyS + b / r2
        fyC += Math.abs(fyS) >= Math.abs(b / r2) ? (fyS - t) + b / r2 : (b / r2 - t) + fyS
        fyS = t
      }
      fxs = fxS + fxC
      fys = fyS + fyC
    }
    else {
      flushLanes(prod)
      // columns skipped by the vector loop: the pair containing i, and the last odd column
      const jStart = i & ~1
      for (let k = jStart; k < min(jStart + 2, n); k++) {
        if (k == i) continue
        const a = ld(px, i) - ld(px, k)
        const b = ld(py, i) - ld(py, k)
        const r2 = a * a + b * b
        if (r2 == 0) return flag(min(i, k), max(i, k))
        accAdd(Math.log(r2))
        fxs += a / r2
        fys += b / r2
      }
      if ((n & 1) == 1 && n - 1 != i && n - 1 != jStart && n - 1 != jStart + 1) {
        const a = ld(px, i) - ld(px, n - 1)
        const b = ld(py, i) - ld(py, n - 1)
        const r2 = a * a + b * b
        if (r2 == 0) return flag(min(i, n - 1), max(i, n - 1))
        accAdd(Math.log(r2))
        fxs += a / r2
        fys += b / r2
      }
    }
    st(outPhi, i, -0.5 * (accS + accC))
    st(outFx, i, fxs)
    st(outFy, i, fys)
  }
  return 0
}

/** For i in [i0, i1): φ_i = Σ_{j≠i} 1/|x_i − x_j| and F_i = Σ_{j≠i} (x_i − x_j)/|x_i − x_j|³ in R³. */
export function fieldCoulomb3(px: usize, py: usize, pz: usize, n: i32, i0: i32, i1: i32, outPhi: usize, outFx: usize, outFy: usize, outFz: usize): f64 {
  badI = -1
  badJ = -1
  const one = f64x2.splat(1)
  for (let i = i0; i < i1; i++) {
    const xi = f64x2.splat(ld(px, i))
    const yi = f64x2.splat(ld(py, i))
    const zi = f64x2.splat(ld(pz, i))
    let sp = f64x2.splat(0)
    let cp = sp
    let sx = sp
    let cx = sp
    let sy = sp
    let cy = sp
    let sz = sp
    let cz = sp
    let mn = f64x2.splat(Infinity)
    let j = 0
    for (; j + 1 < n; j += 2) {
      if (j == i || j + 1 == i) continue
      const a = f64x2.sub(xi, vld(px, j))
      const b = f64x2.sub(yi, vld(py, j))
      const c = f64x2.sub(zi, vld(pz, j))
      const r2 = f64x2.add(f64x2.add(f64x2.mul(a, a), f64x2.mul(b, b)), f64x2.mul(c, c))
      mn = f64x2.pmin(mn, r2)
      const ir = f64x2.div(one, f64x2.sqrt(r2))
      const ir3 = f64x2.mul(ir, f64x2.mul(ir, ir))
      cp = neumaier(sp, ir, cp)
      sp = f64x2.add(sp, ir)
      let f = f64x2.mul(a, ir3)
      cx = neumaier(sx, f, cx)
      sx = f64x2.add(sx, f)
      f = f64x2.mul(b, ir3)
      cy = neumaier(sy, f, cy)
      sy = f64x2.add(sy, f)
      f = f64x2.mul(c, ir3)
      cz = neumaier(sz, f, cz)
      sz = f64x2.add(sz, f)
    }
    if (f64x2.extract_lane(mn, 0) == 0 || f64x2.extract_lane(mn, 1) == 0) {
      for (let k = 0; k < n; k++) {
        if (k != i && r2At(px, py, pz, i, k) == 0) return flag(min(i, k), max(i, k))
      }
    }
    let phi = lanes(sp) + lanes(cp)
    let fx = lanes(sx) + lanes(cx)
    let fy = lanes(sy) + lanes(cy)
    let fz = lanes(sz) + lanes(cz)
    const jStart = i & ~1
    for (let e = 0; e < 3; e++) {
      const k = e < 2 ? jStart + e : n - 1
      if (k >= n || k == i) continue
      if (e == 2 && ((n & 1) == 0 || k < jStart + 2)) continue
      const a = ld(px, i) - ld(px, k)
      const b = ld(py, i) - ld(py, k)
      const c = ld(pz, i) - ld(pz, k)
      const r2 = a * a + b * b + c * c
      if (r2 == 0) return flag(min(i, k), max(i, k))
      const ir = 1 / Math.sqrt(r2)
      const ir3 = ir * ir * ir
      phi += ir
      fx += a * ir3
      fy += b * ir3
      fz += c * ir3
    }
    st(outPhi, i, phi)
    st(outFx, i, fx)
    st(outFy, i, fy)
    st(outFz, i, fz)
  }
  return 0
}

// ---------------------------------------------------------------- rectangular blocks

/** Σ_{a0 ≤ i < a1} Σ_{b0 ≤ j < b1, j > i when the ranges are equal} log|x_i − x_j|² (the near field of
 *  a tree method; the ranges are equal or disjoint; coordinates below 1e34; pz holds zeros in the
 *  plane). Four rows at a time against the columns with four independent product chains
 *  (logFourRows), the careful scalar path for a group whose smallest r² is below 1e−70, and the
 *  rows left over one by one. */
export function blockLog2(px: usize, py: usize, pz: usize, a0: i32, a1: i32, b0: i32, b1: i32): f64 {
  badI = -1
  badJ = -1
  const same = a0 == b0
  totalReset()
  productsReset()
  let i = a0
  for (; i + 4 <= a1; i += 4) {
    accReset()
    let ok = true
    let j0 = b0
    if (same) {
      ok = logRowsCarefulRange(px, py, pz, i, i + 4)
      j0 = i + 4
    }
    if (ok && j0 < b1 && !fastFourRows(px, py, pz, b1, i, j0, false)) {
      for (let r = i; ok && r < i + 4; r++) ok = logRowCareful(px, py, pz, r, j0, b1)
    }
    if (!ok) return NaN
    foldGroup()
  }
  accReset()
  productsFlush()
  for (let r = i; r < a1; r++) {
    if (!logRowCareful(px, py, pz, r, same ? r + 1 : b0, b1)) return NaN
  }
  foldGroup()
  return totS + totC
}

/** Σ_{a0 ≤ i < a1} Σ_{b0 ≤ j < b1, j > i when the ranges are equal} 1/|x_i − x_j| in R³ (the near field
 *  of the 3-D FMM; the ranges are equal or disjoint). All terms are positive: each row is summed in
 *  two SIMD lanes (at most a few hundred terms each) and the row sums are added with compensation.
 *  A zero distance returns NaN and records the pair. */
export function blockCoulomb3(px: usize, py: usize, pz: usize, a0: i32, a1: i32, b0: i32, b1: i32): f64 {
  badI = -1
  badJ = -1
  accReset()
  const same = a0 == b0
  const one = f64x2.splat(1)
  for (let i = a0; i < a1; i++) {
    const xi = ld(px, i)
    const yi = ld(py, i)
    const zi = ld(pz, i)
    const vx = f64x2.splat(xi)
    const vy = f64x2.splat(yi)
    const vz = f64x2.splat(zi)
    let s0 = f64x2.splat(0)
    let s1 = f64x2.splat(0)
    const js = same ? i + 1 : b0
    let j = js
    for (; j + 3 < b1; j += 4) {
      const r0 = rowR2(vx, vy, vz, vld(px, j), vld(py, j), vld(pz, j), true)
      const r1 = rowR2(vx, vy, vz, vld(px, j + 2), vld(py, j + 2), vld(pz, j + 2), true)
      s0 = f64x2.add(s0, f64x2.div(one, f64x2.sqrt(r0)))
      s1 = f64x2.add(s1, f64x2.div(one, f64x2.sqrt(r1)))
    }
    const s = f64x2.add(s0, s1)
    let row = f64x2.extract_lane(s, 0) + f64x2.extract_lane(s, 1)
    for (; j < b1; j++) row += 1 / Math.sqrt(r2At(px, py, pz, i, j))
    if (!(row < Infinity)) {
      for (let k = js; k < b1; k++) {
        if (r2At(px, py, pz, i, k) == 0) return flag(i, k)
      }
    }
    accAdd(row)
  }
  return accS + accC
}
