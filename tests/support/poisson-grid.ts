// Test tool: the 2-D electric energy (1/2π) ∫ |∇h|² by solving −Δh = 2π(Σ_k δ^{(η_k)}_{x_k} − Nμ) on a
// grid, for μ the uniform disk of radius R centred at 0; independent of the smeared pair formulas.
// Method: bilinear (Q1) finite elements on the box [−B, B]² with n × n square cells; Dirichlet
// data on ∂box equal to the exact potential there, Σ_k −log|y − x_k| + N log|y| (Newton's theorem:
// outside all circles and the disk the charges act as points); the stiffness matrix
// K = K₁⊗M₁ + M₁⊗K₁ is diagonalised by the discrete sine transform (Strang & Fix, An Analysis of
// the Finite Element Method, 1973, §1.3; fast Poisson solvers: Buzbee, Golub & Nielson, SIAM J.
// Numer. Anal. 7, 1970), computed with a radix-2 FFT (Cooley & Tukey, Math. Comp. 19, 1965).
// Load vector: circle charges sampled at many equally spaced angles, the disk by exact cell
// areas inside and sub-cell midpoints on cut cells. Energy = Galerkin energy in the box plus the
// exterior energy −∮_{∂box} h ∂_n h (Green's identity; h = O(1/|y|) at infinity for a neutral
// charge), the boundary integral by composite Gauss–Legendre quadrature.
// Accuracy: the potential has gradient jumps on the circles, so the Galerkin energy error is
// O(h) (Strang & Fix 1973, ch. 3): the solver returns the values at n and n/2 as well.
import { compositeGL } from './uniform-measures'

function fft(re: Float64Array, im: Float64Array): void {
  const n = re.length
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1
    for (; j & bit; bit >>= 1) j ^= bit
    j ^= bit
    if (i < j) {
      let t = re[i]
      re[i] = re[j]
      re[j] = t
      t = im[i]
      im[i] = im[j]
      im[j] = t
    }
  }
  for (let len = 2; len <= n; len <<= 1) {
    const ang = (-2 * Math.PI) / len
    const wr = Math.cos(ang)
    const wi = Math.sin(ang)
    for (let i = 0; i < n; i += len) {
      let cr = 1
      let ci = 0
      for (let k = 0; k < len / 2; k++) {
        const a = i + k
        const b = a + len / 2
        const xr = re[b] * cr - im[b] * ci
        const xi = re[b] * ci + im[b] * cr
        re[b] = re[a] - xr
        im[b] = im[a] - xi
        re[a] += xr
        im[a] += xi
        const t = cr * wr - ci * wi
        ci = cr * wi + ci * wr
        cr = t
      }
    }
  }
}

/** In-place DST-I along rows (stride 1) or columns of an M × M array: X_p = Σ_i x_i sin(π p i/(M+1)). */
function dst2(a: Float64Array, M: number): void {
  const n2 = 2 * (M + 1)
  const re = new Float64Array(n2)
  const im = new Float64Array(n2)
  for (const pass of [0, 1]) {
    for (let line = 0; line < M; line++) {
      re.fill(0)
      im.fill(0)
      for (let i = 0; i < M; i++) {
        const v = pass === 0 ? a[line * M + i] : a[i * M + line]
        re[i + 1] = v
        re[n2 - 1 - i] = -v
      }
      fft(re, im)
      for (let p = 0; p < M; p++) {
        const v = -0.5 * im[p + 1]
        if (pass === 0) a[line * M + p] = v
        else a[p * M + line] = v
      }
    }
  }
}

export interface GridProblem {
  centres: Float64Array // flat (x, y)
  etas: Float64Array
  /** Disk radius of the background; N μ has total charge N = number of centres. */
  R: number
  /** Half side of the box (must exceed R and every |x_k| + η_k). */
  B: number
}

/** (1/2π) ∫_{R²} |∇h_grid|² with n cells per side (n a power of two). */
export function gridElectricEnergy(pb: GridProblem, n: number): number {
  const { centres, etas, R, B } = pb
  const N = etas.length
  const h = (2 * B) / n
  const M = n - 1
  const node = (i: number, j: number): number => j * (n + 1) + i
  const coord = (i: number): number => -B + i * h
  const F = new Float64Array((n + 1) * (n + 1)) // ∫ φ_ij d(Σδ − Nμ), before the factor 2π
  // circle charges: periodic trapezoid rule in the angle, bilinear shares to the four nodes
  for (let k = 0; k < N; k++) {
    const K = Math.max(4096, Math.ceil((2 * Math.PI * etas[k] * 64) / h))
    for (let s = 0; s < K; s++) {
      const t = ((s + 0.5) * 2 * Math.PI) / K
      const x = centres[2 * k] + etas[k] * Math.cos(t)
      const y = centres[2 * k + 1] + etas[k] * Math.sin(t)
      const fx = (x + B) / h
      const fy = (y + B) / h
      const i = Math.floor(fx)
      const j = Math.floor(fy)
      const u = fx - i
      const v = fy - j
      const w = 1 / K
      F[node(i, j)] += w * (1 - u) * (1 - v)
      F[node(i + 1, j)] += w * u * (1 - v)
      F[node(i, j + 1)] += w * (1 - u) * v
      F[node(i + 1, j + 1)] += w * u * v
    }
  }
  // background −N/(πR²) on the disk
  const m = N / (Math.PI * R * R)
  const sub = 16
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const x0 = coord(i)
      const y0 = coord(j)
      const far = Math.max(Math.hypot(x0, y0), Math.hypot(x0 + h, y0), Math.hypot(x0, y0 + h), Math.hypot(x0 + h, y0 + h))
      const nx = Math.min(Math.max(0, x0), x0 + h) // nearest point of the cell to the origin
      const ny = Math.min(Math.max(0, y0), y0 + h)
      const near = Math.hypot(nx, ny)
      if (near >= R) continue
      if (far <= R) {
        const w = (m * h * h) / 4
        F[node(i, j)] -= w
        F[node(i + 1, j)] -= w
        F[node(i, j + 1)] -= w
        F[node(i + 1, j + 1)] -= w
        continue
      }
      const w = (m * h * h) / (sub * sub)
      for (let b = 0; b < sub; b++) {
        for (let a = 0; a < sub; a++) {
          const u = (a + 0.5) / sub
          const v = (b + 0.5) / sub
          if (Math.hypot(x0 + u * h, y0 + v * h) >= R) continue
          F[node(i, j)] -= w * (1 - u) * (1 - v)
          F[node(i + 1, j)] -= w * u * (1 - v)
          F[node(i, j + 1)] -= w * (1 - u) * v
          F[node(i + 1, j + 1)] -= w * u * v
        }
      }
    }
  }
  // exact potential and gradient outside all charges
  const hExact = (x: number, y: number): number => {
    let s = N * 0.5 * Math.log(x * x + y * y)
    for (let k = 0; k < N; k++) s -= 0.5 * Math.log((x - centres[2 * k]) ** 2 + (y - centres[2 * k + 1]) ** 2)
    return s
  }
  const gradExact = (x: number, y: number): [number, number] => {
    const r2 = x * x + y * y
    let gx = (N * x) / r2
    let gy = (N * y) / r2
    for (let k = 0; k < N; k++) {
      const dx = x - centres[2 * k]
      const dy = y - centres[2 * k + 1]
      const d2 = dx * dx + dy * dy
      gx -= dx / d2
      gy -= dy / d2
    }
    return [gx, gy]
  }
  const U = new Float64Array((n + 1) * (n + 1))
  for (let i = 0; i <= n; i++) {
    U[node(i, 0)] = hExact(coord(i), -B)
    U[node(i, n)] = hExact(coord(i), B)
    U[node(0, i)] = hExact(-B, coord(i))
    U[node(n, i)] = hExact(B, coord(i))
  }
  // right-hand side on interior nodes: 2π F − K_IB u_B (Q1 stencil (1/3)[−1 −1 −1; −1 8 −1; −1 −1 −1])
  const rhs = new Float64Array(M * M)
  for (let j = 1; j < n; j++) {
    for (let i = 1; i < n; i++) {
      let ku = 0
      for (let dj = -1; dj <= 1; dj++) {
        for (let di = -1; di <= 1; di++) {
          if (di === 0 && dj === 0) continue
          const ii = i + di
          const jj = j + dj
          if (ii === 0 || jj === 0 || ii === n || jj === n) ku -= U[node(ii, jj)] / 3
        }
      }
      rhs[(j - 1) * M + (i - 1)] = 2 * Math.PI * F[node(i, j)] - ku
    }
  }
  dst2(rhs, M)
  const kk = new Float64Array(M)
  const mm = new Float64Array(M)
  for (let p = 0; p < M; p++) {
    const c = Math.cos((Math.PI * (p + 1)) / n)
    kk[p] = (2 - 2 * c) / h
    mm[p] = (h * (4 + 2 * c)) / 6
  }
  for (let q = 0; q < M; q++) for (let p = 0; p < M; p++) rhs[q * M + p] /= kk[p] * mm[q] + mm[p] * kk[q]
  dst2(rhs, M)
  const scale = (2 / n) ** 2
  for (let j = 1; j < n; j++) for (let i = 1; i < n; i++) U[node(i, j)] = rhs[(j - 1) * M + (i - 1)] * scale
  // Galerkin energy in the box: Σ_cells u_eᵀ K_e u_e, K_e = (1/6)[4 −1 −2 −1; …] (counter-clockwise corners)
  let box = 0
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const a = U[node(i, j)]
      const b = U[node(i + 1, j)]
      const c = U[node(i + 1, j + 1)]
      const d = U[node(i, j + 1)]
      box += (4 * (a * a + b * b + c * c + d * d) - 2 * (a * b + b * c + c * d + d * a) - 4 * (a * c + b * d)) / 6
    }
  }
  // exterior energy −∮ h ∂_n h, n the outward normal of the box
  const side = (f: (t: number) => number): number => compositeGL(f, -B, B, 64)
  const ext = -(
    side(t => hExact(B, t) * gradExact(B, t)[0])
    - side(t => hExact(-B, t) * gradExact(-B, t)[0])
    + side(t => hExact(t, B) * gradExact(t, B)[1])
    - side(t => hExact(t, -B) * gradExact(t, -B)[1])
  )
  return (box + ext) / (2 * Math.PI)
}
