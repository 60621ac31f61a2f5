// Seeded test inputs for the statistics and partition-function tests, built here so that the tests do not
// depend on the engine's own samplers:
//   random numbers: xorshift128+ (Vigna, J. Comput. Appl. Math. 315, 2017), normal by Box–Muller
//     (Ann. Math. Stat. 29, 1958), gamma by Marsaglia & Tsang (ACM TOMS 26, 2000), Poisson by Knuth's
//     product method (TAOCP vol. 2, §3.4.1) on pieces of mean ≤ 100;
//   β-Hermite ensemble: the tridiagonal model of Dumitriu & Edelman (J. Math. Phys. 43, 2002), diagonal
//     N(0, 1), off-diagonal χ_{kβ}/√2, k = N−1 … 1, whose eigenvalues have density ∝ Π|λ_i − λ_j|^β e^{−Σλ²/2};
//     eigenvalues by Sturm-sequence bisection (Wilkinson, The Algebraic Eigenvalue Problem, 1965, §5.37);
//   Ginibre: eigenvalues of an N×N matrix of independent standard complex Gaussians (E|G_ij|² = 1; Ginibre,
//     J. Math. Phys. 6, 1965) by Householder reduction to Hessenberg form and the shifted complex QR
//     algorithm with Givens rotations (Golub & Van Loan, Matrix Computations, 4th ed. 2013, §7.4–7.5);
//   2×2 Gaussian matrices: the spacing of [[a, b], [b̄, c]] is √((a − c)² + 4|b|²), with b real, complex
//     or quaternion (1, 2 or 4 real components of variance ½; a, c ~ N(0, 1)) for β = 1, 2, 4 (Mehta,
//     Random Matrices, 2004, §1.5);
//   Gauss–Hermite rule: nodes the zeros of H_n by bisection of the Jacobi matrix, weights
//     2^{n−1} n! √π / (n² H_{n−1}(x_i)²) (Abramowitz & Stegun 1964, 25.4.46).

export interface TestRng {
  uniform: () => number
  normal: () => number
  gamma: (shape: number) => number
  poisson: (mean: number) => number
}

export function createTestRng(seed: number): TestRng {
  // splitmix64-style seeding of two 64-bit words, kept as BigInt for exactness
  const mask = (1n << 64n) - 1n
  let z = BigInt(Math.floor(seed)) & mask
  const next = (): bigint => {
    z = (z + 0x9e3779b97f4a7c15n) & mask
    let x = z
    x = ((x ^ (x >> 30n)) * 0xbf58476d1ce4e5b9n) & mask
    x = ((x ^ (x >> 27n)) * 0x94d049bb133111ebn) & mask
    return x ^ (x >> 31n)
  }
  let s0 = next()
  let s1 = next()
  const uniform = (): number => {
    let x = s0
    const y = s1
    s0 = y
    x = (x ^ (x << 23n)) & mask
    s1 = x ^ y ^ (x >> 17n) ^ (y >> 26n)
    const out = (s1 + y) & mask
    return Number(out >> 11n) / 9007199254740992
  }
  let spare: number | undefined
  const normal = (): number => {
    if (spare !== undefined) {
      const v = spare
      spare = undefined
      return v
    }
    let u = 0
    while (u === 0) u = uniform()
    const v = uniform()
    const r = Math.sqrt(-2 * Math.log(u))
    spare = r * Math.sin(2 * Math.PI * v)
    return r * Math.cos(2 * Math.PI * v)
  }
  const gamma = (shape: number): number => {
    if (shape < 1) return gamma(shape + 1) * Math.pow(uniform() || 1e-300, 1 / shape)
    const d = shape - 1 / 3
    const c = 1 / Math.sqrt(9 * d)
    for (;;) {
      let x: number
      let v: number
      do {
        x = normal()
        v = 1 + c * x
      } while (v <= 0)
      v = v * v * v
      const u = uniform()
      if (u < 1 - 0.0331 * x ** 4 || Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) return d * v
    }
  }
  const poisson = (mean: number): number => {
    let total = 0
    let left = mean
    while (left > 0) {
      const piece = Math.min(left, 100)
      left -= piece
      const L = Math.exp(-piece)
      let k = 0
      let p = uniform()
      while (p > L) {
        k++
        p *= uniform()
      }
      total += k
    }
    return total
  }
  return { uniform, normal, gamma, poisson }
}

/** Eigenvalues (ascending) of the symmetric tridiagonal matrix with diagonal a and off-diagonal b. */
export function tridiagonalEigenvalues(a: Float64Array, b: Float64Array): Float64Array {
  const n = a.length
  let lo = Infinity
  let hi = -Infinity
  for (let i = 0; i < n; i++) {
    const r = (i > 0 ? Math.abs(b[i - 1]) : 0) + (i < n - 1 ? Math.abs(b[i]) : 0)
    lo = Math.min(lo, a[i] - r)
    hi = Math.max(hi, a[i] + r)
  }
  // number of eigenvalues < x (Sturm count)
  const below = (x: number): number => {
    let count = 0
    let q = 1
    for (let i = 0; i < n; i++) {
      q = a[i] - x - (i > 0 ? (b[i - 1] * b[i - 1]) / q : 0)
      if (q === 0) q = 1e-300
      if (q < 0) count++
    }
    return count
  }
  const out = new Float64Array(n)
  for (let k = 0; k < n; k++) {
    let l = lo
    let h = hi
    for (let it = 0; it < 200 && h - l > 1e-15 * Math.max(1, Math.abs(l) + Math.abs(h)); it++) {
      const m = (l + h) / 2
      if (below(m) > k) h = m
      else l = m
    }
    out[k] = (l + h) / 2
  }
  return out
}

/** A sample of the Gaussian β-ensemble: density ∝ Π|λ_i − λ_j|^β e^{−Σλ²/2} (ascending). */
export function betaHermite(N: number, beta: number, rng: TestRng): Float64Array {
  const a = new Float64Array(N)
  const b = new Float64Array(Math.max(0, N - 1))
  for (let i = 0; i < N; i++) a[i] = rng.normal()
  for (let i = 0; i < N - 1; i++) b[i] = Math.sqrt(rng.gamma(((N - 1 - i) * beta) / 2)) // χ_k/√2 = √(Gamma(k/2, 1))
  return tridiagonalEigenvalues(a, b)
}

/** The same points in the canonical convention with V = a x² (x = λ/√(βNa)). */
export function toCanonicalLine(lambda: Float64Array, beta: number, a: number): Float64Array {
  const c = 1 / Math.sqrt(beta * lambda.length * a)
  return lambda.map(v => v * c)
}

/** The spacing of a 2×2 Gaussian matrix of symmetry class β = 1, 2, 4. */
export function spacing2x2(beta: 1 | 2 | 4, rng: TestRng): number {
  const a = rng.normal()
  const c = rng.normal()
  let off = 0
  for (let k = 0; k < beta; k++) off += (rng.normal() * Math.SQRT1_2) ** 2
  return Math.sqrt((a - c) ** 2 + 4 * off)
}

/** Eigenvalues (flat re, im) of an N×N matrix of independent standard complex Gaussians. */
export function ginibreEigenvalues(N: number, rng: TestRng): Float64Array {
  const re = new Float64Array(N * N)
  const im = new Float64Array(N * N)
  for (let k = 0; k < N * N; k++) {
    re[k] = rng.normal() * Math.SQRT1_2
    im[k] = rng.normal() * Math.SQRT1_2
  }
  return complexEigenvalues(N, re, im)
}

function csqrt(x: number, y: number): [number, number] {
  const r = Math.hypot(x, y)
  const u = Math.sqrt((r + Math.abs(x)) / 2)
  if (u === 0) return [0, 0]
  const v = y / (2 * u)
  return x >= 0 ? [u, v] : [Math.abs(v), y >= 0 ? u : -u]
}

/** Eigenvalues (flat re, im) of a general complex matrix given row-major (re, im); the inputs are overwritten. */
export function complexEigenvalues(n: number, re: Float64Array, im: Float64Array): Float64Array {
  const at = (i: number, j: number): number => i * n + j
  // Householder reduction to upper Hessenberg form
  for (let k = 0; k < n - 2; k++) {
    let norm = 0
    for (let i = k + 1; i < n; i++) norm += re[at(i, k)] ** 2 + im[at(i, k)] ** 2
    norm = Math.sqrt(norm)
    if (norm === 0) continue
    const x0r = re[at(k + 1, k)]
    const x0i = im[at(k + 1, k)]
    const x0 = Math.hypot(x0r, x0i)
    const pr = x0 === 0 ? 1 : x0r / x0
    const pi = x0 === 0 ? 0 : x0i / x0
    const vr = new Float64Array(n)
    const vi = new Float64Array(n)
    for (let i = k + 1; i < n; i++) {
      vr[i] = re[at(i, k)]
      vi[i] = im[at(i, k)]
    }
    vr[k + 1] += pr * norm
    vi[k + 1] += pi * norm
    let vn = 0
    for (let i = k + 1; i < n; i++) vn += vr[i] ** 2 + vi[i] ** 2
    vn = Math.sqrt(vn)
    for (let i = k + 1; i < n; i++) {
      vr[i] /= vn
      vi[i] /= vn
    }
    // left: H ← H − 2 v (v* H)
    for (let j = 0; j < n; j++) {
      let wr = 0
      let wi = 0
      for (let i = k + 1; i < n; i++) {
        wr += vr[i] * re[at(i, j)] + vi[i] * im[at(i, j)]
        wi += vr[i] * im[at(i, j)] - vi[i] * re[at(i, j)]
      }
      for (let i = k + 1; i < n; i++) {
        re[at(i, j)] -= 2 * (vr[i] * wr - vi[i] * wi)
        im[at(i, j)] -= 2 * (vr[i] * wi + vi[i] * wr)
      }
    }
    // right: H ← H − 2 (H v) v*
    for (let i = 0; i < n; i++) {
      let wr = 0
      let wi = 0
      for (let j = k + 1; j < n; j++) {
        wr += re[at(i, j)] * vr[j] - im[at(i, j)] * vi[j]
        wi += re[at(i, j)] * vi[j] + im[at(i, j)] * vr[j]
      }
      for (let j = k + 1; j < n; j++) {
        re[at(i, j)] -= 2 * (wr * vr[j] + wi * vi[j])
        im[at(i, j)] -= 2 * (wi * vr[j] - wr * vi[j])
      }
    }
    for (let i = k + 2; i < n; i++) {
      re[at(i, k)] = 0
      im[at(i, k)] = 0
    }
  }
  const out = new Float64Array(2 * n)
  let hi = n - 1
  let iter = 0
  const cs = new Float64Array(n)
  const snr = new Float64Array(n)
  const sni = new Float64Array(n)
  while (hi >= 0) {
    if (hi === 0) {
      out[0] = re[0]
      out[1] = im[0]
      break
    }
    let l = hi
    while (l > 0) {
      const sub = Math.hypot(re[at(l, l - 1)], im[at(l, l - 1)])
      const diag = Math.hypot(re[at(l, l)], im[at(l, l)]) + Math.hypot(re[at(l - 1, l - 1)], im[at(l - 1, l - 1)])
      if (sub <= 1e-16 * diag) {
        re[at(l, l - 1)] = 0
        im[at(l, l - 1)] = 0
        break
      }
      l--
    }
    if (l === hi) {
      out[2 * hi] = re[at(hi, hi)]
      out[2 * hi + 1] = im[at(hi, hi)]
      hi--
      iter = 0
      continue
    }
    // Wilkinson shift: the eigenvalue of the trailing 2×2 block closer to its last entry
    const ar = re[at(hi - 1, hi - 1)]
    const ai = im[at(hi - 1, hi - 1)]
    const br = re[at(hi - 1, hi)]
    const bi = im[at(hi - 1, hi)]
    const cr = re[at(hi, hi - 1)]
    const ci = im[at(hi, hi - 1)]
    const dr = re[at(hi, hi)]
    const di = im[at(hi, hi)]
    const hr = (ar - dr) / 2
    const hi2 = (ai - di) / 2
    const [sr, si] = csqrt(hr * hr - hi2 * hi2 + (br * cr - bi * ci), 2 * hr * hi2 + (br * ci + bi * cr))
    const mr = (ar + dr) / 2
    const mi = (ai + di) / 2
    let shr = mr + sr
    let shi = mi + si
    if (Math.hypot(mr - sr - dr, mi - si - di) < Math.hypot(shr - dr, shi - di)) {
      shr = mr - sr
      shi = mi - si
    }
    iter++
    if (iter % 11 === 0) {
      shr = dr + Math.hypot(cr, ci)
      shi = di
    }
    if (iter > 1000) throw new Error('complex QR did not converge')
    for (let k = l; k <= hi; k++) {
      re[at(k, k)] -= shr
      im[at(k, k)] -= shi
    }
    // QR by Givens rotations on rows, then RQ on columns
    for (let k = l; k < hi; k++) {
      const xr = re[at(k, k)]
      const xi = im[at(k, k)]
      const yr = re[at(k + 1, k)]
      const yi = im[at(k + 1, k)]
      const ax = Math.hypot(xr, xi)
      const r = Math.hypot(ax, Math.hypot(yr, yi))
      let c: number
      let s0: number
      let s1: number
      if (r === 0) {
        c = 1
        s0 = 0
        s1 = 0
      }
      else if (ax === 0) {
        c = 0
        s0 = yr / r
        s1 = -yi / r
      }
      else {
        c = ax / r
        // s = (x/|x|) conj(y) / r
        const ur = xr / ax
        const ui = xi / ax
        s0 = (ur * yr + ui * yi) / r
        s1 = (ui * yr - ur * yi) / r
      }
      cs[k] = c
      snr[k] = s0
      sni[k] = s1
      for (let j = k; j <= hi; j++) {
        const pr = re[at(k, j)]
        const pi = im[at(k, j)]
        const qr = re[at(k + 1, j)]
        const qi = im[at(k + 1, j)]
        re[at(k, j)] = c * pr + (s0 * qr - s1 * qi)
        im[at(k, j)] = c * pi + (s0 * qi + s1 * qr)
        re[at(k + 1, j)] = -(s0 * pr + s1 * pi) + c * qr
        im[at(k + 1, j)] = -(s0 * pi - s1 * pr) + c * qi
      }
    }
    for (let k = l; k < hi; k++) {
      const c = cs[k]
      const s0 = snr[k]
      const s1 = sni[k]
      const top = Math.min(hi, k + 2)
      for (let i = l; i <= top; i++) {
        const pr = re[at(i, k)]
        const pi = im[at(i, k)]
        const qr = re[at(i, k + 1)]
        const qi = im[at(i, k + 1)]
        // col k ← c p + conj(s) q ; col k+1 ← −s p + c q
        re[at(i, k)] = c * pr + (s0 * qr + s1 * qi)
        im[at(i, k)] = c * pi + (s0 * qi - s1 * qr)
        re[at(i, k + 1)] = -(s0 * pr - s1 * pi) + c * qr
        im[at(i, k + 1)] = -(s0 * pi + s1 * pr) + c * qi
      }
    }
    for (let k = l; k <= hi; k++) {
      re[at(k, k)] += shr
      im[at(k, k)] += shi
    }
  }
  return out
}

/** Gauss–Hermite nodes and weights for ∫ f(x) e^{−x²} dx (exact for polynomials of degree ≤ 2n − 1). */
export function gaussHermite(n: number): { x: Float64Array, w: Float64Array } {
  const a = new Float64Array(n)
  const b = Float64Array.from({ length: n - 1 }, (_, k) => Math.sqrt((k + 1) / 2))
  const x = tridiagonalEigenvalues(a, b)
  let fact = 1
  for (let k = 2; k <= n; k++) fact *= k
  const w = x.map((t) => {
    let h0 = 1
    let h1 = 2 * t
    if (n === 1) return Math.sqrt(Math.PI)
    for (let k = 1; k < n - 1; k++) {
      const h2 = 2 * t * h1 - 2 * k * h0
      h0 = h1
      h1 = h2
    }
    return (Math.pow(2, n - 1) * fact * Math.sqrt(Math.PI)) / (n * n * h1 * h1)
  })
  return { x, w }
}

/** Poisson points of intensity ρ in the disk/ball of radius R (d = 1, 2, 3) centred at 0. */
export function poissonBall(rho: number, R: number, d: number, rng: TestRng): Float64Array {
  const vol = d === 1 ? 2 * R : d === 2 ? Math.PI * R * R : (4 / 3) * Math.PI * R ** 3
  const n = rng.poisson(rho * vol)
  const out: number[] = []
  while (out.length < n * d) {
    const y = Array.from({ length: d }, () => (2 * rng.uniform() - 1) * R)
    if (y.reduce((s, v) => s + v * v, 0) <= R * R) out.push(...y)
  }
  return Float64Array.from(out)
}

/** Poisson points of intensity ρ in [0, L)^d. */
export function poissonBox(rho: number, L: number, d: number, rng: TestRng): Float64Array {
  const n = rng.poisson(rho * L ** d)
  return Float64Array.from({ length: n * d }, () => rng.uniform() * L)
}

/** The triangular lattice with spacing s: points i·(s, 0) + j·(s/2, s√3/2) within radius R of 0. */
export function triangularPatch(s: number, R: number): Float64Array {
  const out: number[] = []
  const m = Math.ceil((2 * R) / s) + 2
  for (let i = -m; i <= m; i++) {
    for (let j = -m; j <= m; j++) {
      const x = s * (i + j / 2)
      const y = (s * Math.sqrt(3) * j) / 2
      if (x * x + y * y <= R * R) out.push(x, y)
    }
  }
  return Float64Array.from(out)
}
