// Test configurations for the fast pair sums: uniform, clustered and lattice points (seeded).

/** A small seeded generator (mulberry32; common practice). */
export function seeded(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

function gauss(rnd: () => number): number {
  const u = 1 - rnd()
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rnd())
}

/** N points uniform in [0, 1)^d. */
export function uniform(N: number, d: number, seed: number): Float64Array {
  const rnd = seeded(seed)
  const p = new Float64Array(N * d)
  for (let k = 0; k < p.length; k++) p[k] = rnd()
  return p
}

/** N points in Gaussian clusters of very different scales (1, 1e−2, 1e−5) at separate centres. */
export function clustered(N: number, d: number, seed: number): Float64Array {
  const rnd = seeded(seed)
  const scales = [1, 1e-2, 1e-5]
  const p = new Float64Array(N * d)
  for (let i = 0; i < N; i++) {
    const c = i % 3
    for (let k = 0; k < d; k++) p[i * d + k] = 3 * c + scales[c] * gauss(rnd)
  }
  return p
}

/** The first N points of a square (d = 2) or cubic (d = 3) or 1-D lattice with spacing h. */
export function lattice(N: number, d: number, h = 1): Float64Array {
  const side = Math.ceil(Math.pow(N, 1 / d))
  const p = new Float64Array(N * d)
  for (let i = 0; i < N; i++) {
    let m = i
    for (let k = 0; k < d; k++) {
      p[i * d + k] = h * (m % side)
      m = Math.floor(m / side)
    }
  }
  return p
}

/** N points uniform on the unit sphere S² (points in R³). */
export function sphere(N: number, seed: number): Float64Array {
  const rnd = seeded(seed)
  const p = new Float64Array(3 * N)
  for (let i = 0; i < N; i++) {
    const z = 2 * rnd() - 1
    const t = 2 * Math.PI * rnd()
    const r = Math.sqrt(1 - z * z)
    p[3 * i] = r * Math.cos(t)
    p[3 * i + 1] = r * Math.sin(t)
    p[3 * i + 2] = z
  }
  return p
}

export function relErr(a: number, b: number): number {
  return Math.abs(a - b) / Math.abs(b)
}
