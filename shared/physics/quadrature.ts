// Numerical quadrature shared by the equilibrium solvers.
//   Gauss–Legendre: nodes are the zeros of P_n, found by Newton's method on the three-term recurrence
//     (n+1) P_{n+1}(x) = (2n+1) x P_n(x) − n P_{n−1}(x), weights w_i = 2 / ((1 − x_i²) P_n'(x_i)²)
//     (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, 25.4.29; 22.7.10).
//   Gauss–Chebyshev (first kind): ∫_{−1}^{1} f(s)/√(1−s²) ds ≈ (π/n) Σ f(cos((2k−1)π/(2n)))
//     (Abramowitz & Stegun 1964, 25.4.38).
//   Adaptive Gauss–Kronrod G7/K15 with the error estimate |K15 − G7| refined by bisection of the worst
//     interval (Kronrod, Nodes and Weights of Quadrature Formulas, 1965; Piessens et al., QUADPACK, 1983).
//   Tanh–sinh (double exponential) rule for integrable endpoint singularities
//     (Takahasi & Mori, Publ. RIMS Kyoto Univ. 9, 1974).

export interface QuadratureRule {
  readonly nodes: Float64Array
  readonly weights: Float64Array
}

export interface AdaptiveResult {
  /** The integral estimate. */
  readonly value: number
  /** Estimated absolute error. */
  readonly error: number
  /** Number of integrand evaluations. */
  readonly evaluations: number
  /** Number of subintervals in the final partition (tanh–sinh: number of levels). */
  readonly intervals: number
}

export interface AdaptiveOptions {
  /** Absolute error target (default 1e-13). */
  absTol?: number
  /** Relative error target (default 1e-13). */
  relTol?: number
  /** Maximum number of subintervals (default 2000). */
  maxIntervals?: number
  /** Interior points where the integrand is not smooth; the range is split there first. */
  breakpoints?: number[]
}

function checkOrder(n: number, what: string): void {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`${what}: the number of nodes must be an integer ≥ 1 (got ${n})`)
}

/** Gauss–Legendre rule with n nodes on [−1, 1], nodes increasing. Exact for polynomials of degree ≤ 2n − 1. */
export function gaussLegendre(n: number): QuadratureRule {
  checkOrder(n, 'gaussLegendre')
  const nodes = new Float64Array(n)
  const weights = new Float64Array(n)
  const half = Math.floor((n + 1) / 2)
  for (let i = 0; i < half; i++) {
    // Initial guess for the i-th largest zero (A&S 22.16.6 asymptotics), then Newton.
    let x = Math.cos(Math.PI * (i + 0.75) / (n + 0.5))
    let dp = 0
    for (let iter = 0; iter < 100; iter++) {
      let p0 = 1
      let p1 = x
      for (let k = 1; k < n; k++) {
        const p2 = ((2 * k + 1) * x * p1 - k * p0) / (k + 1)
        p0 = p1
        p1 = p2
      }
      const pn = n === 1 ? x : p1
      const pm = n === 1 ? 1 : p0
      dp = n * (x * pn - pm) / (x * x - 1)
      const dx = pn / dp
      x -= dx
      if (Math.abs(dx) < 1e-16) break
    }
    // Recompute the derivative at the converged node.
    let p0 = 1
    let p1 = x
    for (let k = 1; k < n; k++) {
      const p2 = ((2 * k + 1) * x * p1 - k * p0) / (k + 1)
      p0 = p1
      p1 = p2
    }
    dp = n === 1 ? 1 : n * (x * p1 - p0) / (x * x - 1)
    const w = 2 / ((1 - x * x) * dp * dp)
    nodes[n - 1 - i] = x
    nodes[i] = -x
    weights[n - 1 - i] = w
    weights[i] = w
  }
  if (n % 2 === 1) nodes[(n - 1) / 2] = 0
  return { nodes, weights }
}

/** Gauss–Legendre rule with n nodes mapped to [a, b]. */
export function gaussLegendreOn(n: number, a: number, b: number): QuadratureRule {
  const { nodes, weights } = gaussLegendre(n)
  const m = (a + b) / 2
  const h = (b - a) / 2
  const x = new Float64Array(n)
  const w = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    x[i] = m + h * nodes[i]
    w[i] = h * weights[i]
  }
  return { nodes: x, weights: w }
}

/** Gauss–Chebyshev nodes of the first kind on [−1, 1] (weights all π/n for the weight 1/√(1−s²)). */
export function gaussChebyshevFirst(n: number): QuadratureRule {
  checkOrder(n, 'gaussChebyshevFirst')
  const nodes = new Float64Array(n)
  const weights = new Float64Array(n).fill(Math.PI / n)
  for (let k = 0; k < n; k++) nodes[k] = -Math.cos(Math.PI * (k + 0.5) / n)
  return { nodes, weights }
}

// Kronrod 15-point extension of the 7-point Gauss rule (QUADPACK dqk15 constants; the Gauss nodes are
// XGK[1], XGK[3], XGK[5], XGK[7]). Checked in the tests against polynomial exactness and gaussLegendre(7).
const XGK = [
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851,
  0.864864423359769072789712788640926, 0.741531185599394439863864773280788,
  0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
  0.207784955007898467600813678461717, 0,
]
const WGK = [
  0.022935322010529224963732008058970, 0.063092092629978553290700663189204,
  0.104790010322250183839876322541518, 0.140653259715525918745189590510238,
  0.169004726639267902826583426598550, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
]
const WG = [
  0.129484966168869693270611432679082, 0.279705391489276667901467771423780,
  0.381830050505118944950369775488975, 0.417959183673469387755102040816327,
]

/** The 15 Kronrod nodes and weights and the embedded 7-point Gauss weights on [−1, 1] (for tests and callers). */
export function kronrod15(): { nodes: Float64Array, kronrodWeights: Float64Array, gaussWeights: Float64Array } {
  const nodes = new Float64Array(15)
  const kronrodWeights = new Float64Array(15)
  const gaussWeights = new Float64Array(15)
  for (let j = 0; j < 8; j++) {
    nodes[j] = -XGK[j]
    nodes[14 - j] = XGK[j]
    kronrodWeights[j] = WGK[j]
    kronrodWeights[14 - j] = WGK[j]
    if (j % 2 === 1) {
      gaussWeights[j] = WG[(j - 1) / 2]
      gaussWeights[14 - j] = WG[(j - 1) / 2]
    }
  }
  return { nodes, kronrodWeights, gaussWeights }
}

interface Segment { a: number, b: number, value: number, error: number }

function gk15(f: (x: number) => number, a: number, b: number): Segment {
  const m = (a + b) / 2
  const h = (b - a) / 2
  const fc = f(m)
  let k = fc * WGK[7]
  let g = fc * WG[3]
  for (let j = 0; j < 7; j++) {
    const dx = h * XGK[j]
    const s = f(m - dx) + f(m + dx)
    k += WGK[j] * s
    if (j % 2 === 1) g += WG[(j - 1) / 2] * s
  }
  const value = k * h
  const error = Math.abs((k - g) * h)
  if (!Number.isFinite(value)) throw new RangeError(`integrateAdaptive: the integrand is not finite on [${a}, ${b}]`)
  return { a, b, value, error }
}

/**
 * ∫_a^b f(x) dx by adaptive G7/K15: the interval with the largest error estimate is bisected until the sum
 * of the estimates is below max(absTol, relTol·|value|). Finite a < b (a > b gives the negative).
 */
export function integrateAdaptive(f: (x: number) => number, a: number, b: number, options: AdaptiveOptions = {}): AdaptiveResult {
  if (!Number.isFinite(a) || !Number.isFinite(b)) throw new RangeError(`integrateAdaptive: the limits must be finite (got ${a}, ${b})`)
  if (a === b) return { value: 0, error: 0, evaluations: 0, intervals: 0 }
  if (a > b) {
    const r = integrateAdaptive(f, b, a, options)
    return { ...r, value: -r.value }
  }
  const absTol = options.absTol ?? 1e-13
  const relTol = options.relTol ?? 1e-13
  const maxIntervals = options.maxIntervals ?? 2000
  const cuts = [a, ...(options.breakpoints ?? []).filter(p => p > a && p < b).sort((p, q) => p - q), b]
  const segments: Segment[] = []
  for (let i = 0; i + 1 < cuts.length; i++) {
    if (cuts[i + 1] > cuts[i]) segments.push(gk15(f, cuts[i], cuts[i + 1]))
  }
  let evaluations = 15 * segments.length
  for (;;) {
    let value = 0
    let error = 0
    let worst = 0
    for (let i = 0; i < segments.length; i++) {
      value += segments[i].value
      error += segments[i].error
      if (segments[i].error > segments[worst].error) worst = i
    }
    const target = Math.max(absTol, relTol * Math.abs(value))
    const s = segments[worst]
    const mid = (s.a + s.b) / 2
    if (error <= target || segments.length >= maxIntervals || !(mid > s.a && mid < s.b)) {
      return { value, error, evaluations, intervals: segments.length }
    }
    segments[worst] = gk15(f, s.a, mid)
    segments.push(gk15(f, mid, s.b))
    evaluations += 30
  }
}

/**
 * ∫_a^b f(x) dx by the tanh–sinh rule x = m + h·tanh((π/2) sinh t), halving the step until two levels
 * agree to tol. Suited to integrable singularities at a or b (f is never evaluated at the endpoints).
 */
export function integrateTanhSinh(f: (x: number) => number, a: number, b: number, options: { tol?: number, maxLevels?: number } = {}): AdaptiveResult {
  if (!Number.isFinite(a) || !Number.isFinite(b)) throw new RangeError(`integrateTanhSinh: the limits must be finite (got ${a}, ${b})`)
  if (a === b) return { value: 0, error: 0, evaluations: 0, intervals: 0 }
  const tol = options.tol ?? 1e-13
  const maxLevels = options.maxLevels ?? 10
  const h = (b - a) / 2
  const tMax = 6.5 // beyond this 1 − tanh((π/2) sinh t) = 2/(e^{2u} + 1) underflows
  let evaluations = 0
  const term = (t: number): number => {
    const u = (Math.PI / 2) * Math.sinh(t)
    // 1 − |x| computed without cancellation: 1 − tanh|u| = 2 / (e^{2|u|} + 1)
    const gap = 2 / (Math.exp(2 * Math.abs(u)) + 1)
    if (gap === 0) return 0
    const cu = Math.cosh(u)
    const w = (Math.PI / 2) * Math.cosh(t) / (cu * cu)
    const x = u >= 0 ? b - h * gap : a + h * gap
    if (!(x > a && x < b)) return 0 // the node has merged with an endpoint in floating point
    evaluations++
    return w * f(x)
  }
  let step = 1
  let sum = term(0)
  for (let t = step; t <= tMax; t += step) sum += term(t) + term(-t)
  let value = sum * step * h
  let error = Infinity
  for (let level = 1; level <= maxLevels; level++) {
    step /= 2
    for (let t = step; t <= tMax; t += 2 * step) sum += term(t) + term(-t)
    const next = sum * step * h
    error = Math.abs(next - value)
    value = next
    if (error <= tol * Math.max(1, Math.abs(value))) return { value, error, evaluations, intervals: level }
  }
  return { value, error, evaluations, intervals: maxLevels }
}
