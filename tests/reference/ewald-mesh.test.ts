import { describe, it, expect } from 'vitest'
import { fft, fftPlan, nextFftSize, realFieldFromPruned, realSpectrumPruned } from '../../shared/physics/torus/fft'
import { bsplineWeights, chooseMesh, meshReciprocalSum, splineAliasBound } from '../../shared/physics/torus/mesh'
import type { MeshSpec } from '../../shared/physics/torus/mesh'
import { halfExpintPlusLogTable, scaledErfcTable, scaledExpintTable } from '../../shared/physics/torus/tables'
import { erfc, expint1 } from '../../shared/physics/torus/special-functions'
import { MESH_MIN_N, PAIR_RELATIVE_ERROR, selfImageConstant, torusEnergy } from '../../shared/physics/torus/ewald'
import { cellVolume, cubicLattice, dualBasis, triangularLattice } from '../../shared/physics/torus/lattice'
import type { Lattice } from '../../shared/physics/torus/lattice'
import { CompensatedSum } from '../../shared/physics/summation'
import { seeded } from '../support/uniform-measures'

/** The DFT by its definition, X(u) = Σ_t x(t) e^{−2πi t u/n}, phases reduced exactly (t u mod n). */
function dft(re: Float64Array, im: Float64Array): [Float64Array, Float64Array] {
  const n = re.length
  const xr = new Float64Array(n)
  const xi = new Float64Array(n)
  for (let u = 0; u < n; u++) {
    for (let t = 0; t < n; t++) {
      const a = (-2 * Math.PI * ((t * u) % n)) / n
      xr[u] += re[t] * Math.cos(a) - im[t] * Math.sin(a)
      xi[u] += re[t] * Math.sin(a) + im[t] * Math.cos(a)
    }
  }
  return [xr, xi]
}

describe('FFT against the definition of the DFT (common practice)', () => {
  it('lengths with the factors 2, 3, 4 and 5, to 1e−14 relative', () => {
    const rand = seeded(5)
    for (const n of [1, 2, 3, 4, 5, 6, 8, 9, 12, 15, 16, 25, 30, 36, 48, 60, 64, 75, 100, 120, 128, 243]) {
      const re = Float64Array.from({ length: n }, () => rand() - 0.5)
      const im = Float64Array.from({ length: n }, () => rand() - 0.5)
      const [xr, xi] = dft(re, im)
      fft(fftPlan(n), re, im, new Float64Array(n), new Float64Array(n))
      let err = 0
      let size = 0
      for (let u = 0; u < n; u++) {
        err = Math.max(err, Math.hypot(re[u] - xr[u], im[u] - xi[u]))
        size = Math.max(size, Math.hypot(xr[u], xi[u]))
      }
      expect(err).toBeLessThanOrEqual(1e-14 * size)
    }
  })
  it('the pruned real-input spectrum and its inverse equal the multi-dimensional DFT written out (odd and even line counts)', () => {
    const rand = seeded(7)
    for (const [dims, keep] of [[[12, 9], [5, 4]], [[10, 8], [4, 3]], [[8, 6, 5], [3, 2, 2]], [[6, 5, 9], [2, 2, 4]]] as const) {
      const d = dims.length
      const total = dims.reduce((t: number, v: number) => t * v, 1)
      const stride = (a: number) => dims.slice(0, a).reduce((t: number, v: number) => t * v, 1)
      const coords = (k: number) => dims.map((n, a) => Math.floor(k / stride(a)) % n)
      const data = Float64Array.from({ length: total }, () => rand() - 0.5)
      const pruned = realSpectrumPruned(data, dims, keep)
      const K1 = dims[1]
      const K2 = d === 3 ? dims[2] : 1
      const M2 = d === 3 ? keep[2] : 0
      const slot = (u: number[]) => d === 2 ? u[0] * K1 + (u[1] + K1) % K1 : (u[0] * (2 * keep[1] + 1) + u[1] + keep[1]) * K2 + (u[2] + K2) % K2
      // X(u) = Σ_l x(l) e^{−2πi Σ_a l_a u_a / n_a}, phases reduced exactly
      const F = { re: new Float64Array(pruned.re.length), im: new Float64Array(pruned.im.length) }
      const kept: number[][] = []
      for (let u0 = 0; u0 <= keep[0]; u0++) for (let u1 = -keep[1]; u1 <= keep[1]; u1++) for (let u2 = -M2; u2 <= M2; u2++) kept.push(d === 2 ? [u0, u1] : [u0, u1, u2])
      for (const u of kept) {
        let sr = 0
        let si = 0
        for (let k = 0; k < total; k++) {
          const l = coords(k)
          let phase = 0
          for (let a = 0; a < d; a++) phase += ((((l[a] * u[a]) % dims[a]) + dims[a]) % dims[a]) / dims[a]
          sr += data[k] * Math.cos(-2 * Math.PI * phase)
          si += data[k] * Math.sin(-2 * Math.PI * phase)
        }
        expect(Math.abs(pruned.re[slot(u)] - sr)).toBeLessThan(1e-13)
        expect(Math.abs(pruned.im[slot(u)] - si)).toBeLessThan(1e-13)
        F.re[slot(u)] = rand() - 0.5
        F.im[slot(u)] = rand() - 0.5
      }
      // the inverse: Φ(l) = 2 Re Σ_u F(u) e^{+2πi u·l/K} over the kept frequencies
      const phi = realFieldFromPruned(F.re, F.im, dims, keep)
      for (const k of [0, 1, total - 1, Math.floor(total / 3)]) {
        const l = coords(k)
        let ref = 0
        for (const u of kept) {
          let phase = 0
          for (let a = 0; a < d; a++) phase += (l[a] * u[a]) / dims[a]
          ref += 2 * (F.re[slot(u)] * Math.cos(2 * Math.PI * phase) - F.im[slot(u)] * Math.sin(2 * Math.PI * phase))
        }
        expect(Math.abs(phi[k] - ref)).toBeLessThan(1e-12)
      }
    }
    expect(() => realSpectrumPruned(new Float64Array(16), [4, 4], [2, 1])).toThrow(/half the mesh/)
  })
  it('names the lengths it cannot take, and rounds up to one it can', () => {
    expect(() => fftPlan(7)).toThrow(/2, 3 and 5/)
    expect(nextFftSize(7)).toBe(8)
    expect(nextFftSize(97)).toBe(100)
    expect(nextFftSize(121)).toBe(125)
  })
})

describe('cardinal B-splines and the interpolation bound of the mesh', () => {
  it('cubic B-spline values M₄(1) = 1/6, M₄(2) = 2/3 and partition of unity (de Boor, A Practical Guide to Splines, 1978, ch. IX)', () => {
    const w = new Float64Array(4)
    bsplineWeights(4, 0, w)
    expect(w[0]).toBe(0)
    expect(Math.abs(w[1] - 1 / 6)).toBeLessThan(1e-16)
    expect(Math.abs(w[2] - 2 / 3)).toBeLessThan(1e-16)
    expect(Math.abs(w[3] - 1 / 6)).toBeLessThan(1e-16)
    // M₄(x) = x³/6 on [0, 1]
    bsplineWeights(4, 0.3, w)
    expect(Math.abs(w[0] - 0.3 ** 3 / 6)).toBeLessThan(1e-16)
    for (const p of [4, 6, 10, 16, 24]) {
      const v = new Float64Array(p)
      for (const x of [0, 0.17, 0.5, 0.93]) {
        bsplineWeights(p, x, v)
        expect(Math.abs(v.reduce((t, y) => t + y, 0) - 1)).toBeLessThan(1e-14)
        for (const y of v) expect(y).toBeGreaterThanOrEqual(0)
      }
    }
  })
  it('the interpolant b(m) Σ_l M_p(uK − l) e^{2πi m l/K} of e^{2πi m u} errs by no more than ε(m/K), and ε falls with p', () => {
    const rand = seeded(8)
    for (const [p, K] of [[4, 16], [8, 24], [12, 40]]) {
      const w = new Float64Array(p)
      bsplineWeights(p, 0, w)
      for (const m of [1, 3, K / 4, K / 3]) {
        // b(m) from interpolation at u = 0 (the spline must reproduce e^0 = 1 there)
        let sr = 0
        let si = 0
        for (let k = 0; k <= p - 2; k++) {
          sr += w[k + 1] * Math.cos((-2 * Math.PI * m * (k + 1)) / K)
          si += w[k + 1] * Math.sin((-2 * Math.PI * m * (k + 1)) / K)
        }
        const n2 = sr * sr + si * si
        const br = sr / n2
        const bi = -si / n2
        let worst = 0
        for (let trial = 0; trial < 50; trial++) {
          const u = rand()
          const t = u * K
          const base = Math.floor(t)
          const v = new Float64Array(p)
          bsplineWeights(p, t - base, v)
          let ir = 0
          let ii = 0
          for (let s = 0; s < p; s++) {
            const l = base - s
            ir += v[s] * Math.cos((2 * Math.PI * m * l) / K)
            ii += v[s] * Math.sin((2 * Math.PI * m * l) / K)
          }
          const ar = br * ir - bi * ii
          const ai = br * ii + bi * ir
          worst = Math.max(worst, Math.hypot(ar - Math.cos(2 * Math.PI * m * u), ai - Math.sin(2 * Math.PI * m * u)))
        }
        expect(worst).toBeLessThanOrEqual(splineAliasBound(m / K, p) + 1e-14)
      }
    }
    expect(splineAliasBound(0.25, 12)).toBeLessThan(splineAliasBound(0.25, 8))
    expect(splineAliasBound(0.5, 8)).toBe(Number.POSITIVE_INFINITY)
    expect(splineAliasBound(0, 8)).toBe(0)
  })
})

/** The mesh's sum checked against Σ_k w_k |S(k)|² evaluated term by term (phases 2π(m · u mod 1)). */
function exactReciprocal(spec: MeshSpec, points: Float64Array, charges: Float64Array | undefined): number {
  const { d, dual, mmax, kc } = spec
  const N = points.length / d
  const u = Float64Array.from({ length: N * d }, (_, k) => {
    const j = Math.floor(k / d)
    const i = k % d
    let t = 0
    for (let c = 0; c < d; c++) t += dual[i * d + c] * points[j * d + c]
    return t - Math.floor(t)
  })
  const total = new CompensatedSum()
  const M2 = d === 3 ? mmax[2] : 0
  for (let m2 = -M2; m2 <= M2; m2++) {
    for (let m1 = -mmax[1]; m1 <= mmax[1]; m1++) {
      for (let m0 = -mmax[0]; m0 <= mmax[0]; m0++) {
        const first = m0 !== 0 ? m0 : m1 !== 0 ? m1 : m2
        if (!(first > 0)) continue
        const m = [m0, m1, m2]
        let k2 = 0
        for (let c = 0; c < d; c++) {
          let kcmp = 0
          for (let i = 0; i < d; i++) kcmp += 2 * Math.PI * m[i] * dual[i * d + c]
          k2 += kcmp * kcmp
        }
        if (k2 > kc * kc) continue
        let sr = 0
        let si = 0
        for (let j = 0; j < N; j++) {
          let t = 0
          for (let i = 0; i < d; i++) t += m[i] * u[j * d + i]
          t -= Math.round(t)
          const q = charges ? charges[j] : 1
          sr += q * Math.cos(2 * Math.PI * t)
          si += q * Math.sin(2 * Math.PI * t)
        }
        total.add(spec.weight(k2) * (sr * sr + si * si))
      }
    }
  }
  return total.value
}

function specOf(lattice: Lattice, alpha: number, kc: number): MeshSpec {
  const d = lattice.d
  const dual = dualBasis(lattice)
  const volume = cellVolume(lattice)
  const cd = d === 2 ? 2 * Math.PI : 4 * Math.PI
  const mmax = Array.from({ length: d }, (_, i) => {
    let n2 = 0
    for (let c = 0; c < d; c++) n2 += lattice.basis[i * d + c] ** 2
    return Math.floor((kc * Math.sqrt(n2)) / (2 * Math.PI)) + 1
  })
  // the Ewald weights (2 c_d/|Λ|) e^{−k²/(4α)}/k² (ewald.ts header)
  return { d, basis: lattice.basis, dual, kc, mmax, volume, weight: k2 => ((2 * cd) / volume) * (Math.exp(-k2 / (4 * alpha)) / k2) }
}

function configurations(d: 2 | 3, L: number, N: number, rand: () => number): Array<{ name: string, points: Float64Array }> {
  const uniform = Float64Array.from({ length: N * d }, () => L * rand())
  // clustered: a tenth of the cell holds every point
  const clustered = Float64Array.from({ length: N * d }, () => 0.3 * L + 0.1 * L * rand())
  const side = Math.round(Math.pow(N, 1 / d))
  const lattice = Float64Array.from({ length: side ** d * d }, (_, k) => {
    const j = Math.floor(k / d)
    const c = k % d
    return ((Math.floor(j / side ** c) % side) + 0.25) * (L / side)
  })
  return [{ name: 'uniform', points: uniform }, { name: 'clustered', points: clustered }, { name: 'lattice', points: lattice }]
}

describe('the reciprocal sum on a spline mesh (smooth particle-mesh Ewald)', () => {
  it('agrees with the term-by-term sum within its bound, on uniform, clustered and lattice points, square, triangular and cubic cells', () => {
    const rand = seeded(12)
    const cases: Array<[Lattice, 2 | 3, number]> = [[cubicLattice(2, 12), 2, 144], [triangularLattice(150), 2, 144], [cubicLattice(3, 5), 3, 125]]
    for (const [lattice, d, N] of cases) {
      const alpha = 2
      const spec = specOf(lattice, alpha, 2 * 4.5 * Math.sqrt(alpha))
      const L = Math.sqrt(lattice.basis[0] ** 2 + lattice.basis[1] ** 2)
      for (const { name, points } of configurations(d, L, N, rand)) {
        const exact = exactReciprocal(spec, points, undefined)
        for (const [order, grow] of [[6, 2.5], [10, 3], [16, 3]] as const) {
          const sizes = spec.mmax.map(m => nextFftSize(Math.ceil(grow * m)))
          const r = meshReciprocalSum(spec, { sizes, order }, points, undefined, points.length / d)
          const floor = 1e-13 * Math.abs(exact)
          expect(Math.abs(r.value - exact), `${name} d=${d} p=${order}`).toBeLessThanOrEqual(r.bound + floor)
        }
      }
    }
  })
  it('with signed charges, and the chosen mesh meets a requested bound', () => {
    const rand = seeded(13)
    const lattice = cubicLattice(3, 4)
    const alpha = 3
    const spec = specOf(lattice, alpha, 2 * 5 * Math.sqrt(alpha))
    const N = 64
    const points = Float64Array.from({ length: 3 * N }, () => 4 * rand())
    const charges = Float64Array.from({ length: N }, (_, i) => (i % 2 === 0 ? 1 : -1) * (0.5 + rand()))
    const exact = exactReciprocal(spec, points, charges)
    const sumAbs = charges.reduce((t, q) => t + Math.abs(q), 0)
    for (const target of [1e-6, 1e-10, 1e-14]) {
      const choice = chooseMesh(spec, N, target)
      const r = meshReciprocalSum(spec, choice, points, charges, N)
      // the estimate that picks the mesh is a continuum one; the bound reached is computed exactly
      expect(r.bound / sumAbs ** 2).toBeLessThanOrEqual(4 * target)
      expect(Math.abs(r.value - exact)).toBeLessThanOrEqual(r.bound + 1e-13 * Math.abs(exact))
    }
  })
  it('refuses odd orders and meshes too coarse for the wave vectors', () => {
    const spec = specOf(cubicLattice(2, 4), 2, 12)
    expect(() => meshReciprocalSum(spec, { sizes: [64, 64], order: 5 }, new Float64Array(2), undefined, 1)).toThrow(/even/)
    expect(() => meshReciprocalSum(spec, { sizes: [8, 64], order: 6 }, new Float64Array(2), undefined, 1)).toThrow(/direction 0/)
  })
})

describe('torus energies through the mesh', () => {
  it('the tables of the real-space functions match the special functions (whose own checks are in ewald.test.ts)', () => {
    const e1 = halfExpintPlusLogTable()
    const e1x = scaledExpintTable(42)
    const ec = scaledErfcTable(6.5)
    expect(e1.checkedError).toBeLessThan(2e-15)
    expect(e1x.checkedRelativeError).toBeLessThan(PAIR_RELATIVE_ERROR / 2)
    expect(ec.checkedRelativeError).toBeLessThan(PAIR_RELATIVE_ERROR / 2)
    for (const x of [1e-9, 0.01, 0.5, 0.99]) expect(Math.abs(e1.evaluate(x) - 0.5 * (expint1(x) + Math.log(x)))).toBeLessThan(2e-15)
    for (const x of [1, 3.3, 17, 41.9]) expect(Math.abs(e1x.evaluate(x) / (Math.exp(x) * expint1(x)) - 1)).toBeLessThan(PAIR_RELATIVE_ERROR / 2)
    for (const y of [0, 0.3, 1.1, 4.2, 6.4]) expect(Math.abs(ec.evaluate(y) / (Math.exp(y * y) * erfc(y)) - 1)).toBeLessThan(PAIR_RELATIVE_ERROR / 2)
  })
  it('mesh and wave-vector routes agree within the sum of their estimates, at three tolerances, on uniform, clustered and lattice points', () => {
    const rand = seeded(14)
    for (const [d, N] of [[2, 400], [3, 216]] as const) {
      const L = Math.pow(N, 1 / d)
      for (const { name, points } of configurations(d, L, N, rand)) {
        for (const tolerance of [1e-6, 1e-10, 1e-13]) {
          const modes = torusEnergy(cubicLattice(d, L), points, { tolerance, reciprocal: 'modes' })
          const mesh = torusEnergy(cubicLattice(d, L), points, { tolerance, reciprocal: 'mesh' })
          expect(mesh.parameters.reciprocalSpace).toBe('mesh')
          expect(mesh.parameters.mesh?.bound).toBeGreaterThanOrEqual(0)
          expect(Math.abs(mesh.value - modes.value), `${name} d=${d} tol=${tolerance}`).toBeLessThanOrEqual(mesh.errorEstimate + modes.errorEstimate)
          // the error estimates follow the tolerance
          expect(mesh.errorEstimate).toBeLessThan(Math.max(1e-9, 1e3 * tolerance) * Math.abs(mesh.value) + 1e-9)
        }
      }
    }
  })
  it(`is the default from ${MESH_MIN_N} points on; replication gives H_T/N = c₀ (square lattice, c₀ from Kronecker’s limit formula in ewald.test.ts)`, () => {
    const k = Math.ceil(Math.sqrt(MESH_MIN_N))
    const pts: number[] = []
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) pts.push(i + 0.25, j + 0.5)
    const res = torusEnergy(cubicLattice(2, k), Float64Array.from(pts))
    expect(res.parameters.reciprocalSpace).toBe('mesh')
    expect(res.parameters.realSpace).toBe('cells')
    expect(Math.abs(res.value / (k * k) - selfImageConstant(cubicLattice(2, 1)).value)).toBeLessThan(1e-11)
    expect(res.errorEstimate).toBeLessThan(1e-8)
    const small = torusEnergy(cubicLattice(2, 3), Float64Array.from([0, 0, 1, 1, 2, 2]))
    expect(small.parameters.reciprocalSpace).toBe('modes')
  })
  it('rock salt through the mesh: Madelung constant M = 1.747564594633 (CRC Handbook of Chemistry and Physics, standard handbook value) from a 6 × 6 × 6 supercell', () => {
    const cell = [0, 0, 0, 1, 1, 0, 1, 0, 1, 0, 1, 1, 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1]
    const qc = [1, 1, 1, 1, -1, -1, -1, -1]
    const pts: number[] = []
    const qs: number[] = []
    for (let a = 0; a < 6; a++) {
      for (let b = 0; b < 6; b++) {
        for (let c = 0; c < 6; c++) {
          for (let i = 0; i < 8; i++) {
            pts.push(cell[3 * i] + 2 * a, cell[3 * i + 1] + 2 * b, cell[3 * i + 2] + 2 * c)
            qs.push(qc[i])
          }
        }
      }
    }
    const res = torusEnergy(cubicLattice(3, 12), Float64Array.from(pts), { charges: Float64Array.from(qs), reciprocal: 'mesh' })
    expect(res.parameters.reciprocalSpace).toBe('mesh')
    expect(Math.abs(-res.value / qs.length - 1.747564594633)).toBeLessThan(1e-10)
  })
  it('the sheet interaction through the mesh: a replicated triangular lattice gives H_T/N = c₀ (½c₀ r_s = −1.1061 is checked in ewald.test.ts)', () => {
    // 30 × 30 points of the unit-area triangular lattice inside the triangular cell of area 900
    const unit = triangularLattice(1).basis
    const pts: number[] = []
    for (let i = 0; i < 30; i++) for (let j = 0; j < 30; j++) pts.push(i * unit[0] + j * unit[2] + 0.1, i * unit[1] + j * unit[3] + 0.2)
    const res = torusEnergy(triangularLattice(900), Float64Array.from(pts), { interaction: 'sheet-coulomb', reciprocal: 'mesh' })
    const c0 = selfImageConstant(triangularLattice(1), { interaction: 'sheet-coulomb' }).value
    expect(Math.abs(res.value / 900 - c0)).toBeLessThan(1e-10)
  })
  it('names coincident points and refuses an unknown route', () => {
    const N = MESH_MIN_N + 10
    const pts = Float64Array.from({ length: 2 * N }, (_, k) => ((k * 0.6180339887) % 1) * 50)
    pts[2 * 900] = pts[2 * 33] + 50
    pts[2 * 900 + 1] = pts[2 * 33 + 1]
    expect(() => torusEnergy(cubicLattice(2, 50), pts)).toThrow(/points 33 and 900 coincide/)
    expect(() => torusEnergy(cubicLattice(2, 50), pts.subarray(0, 20), { reciprocal: 'grid' as 'mesh' })).toThrow(/modes.*mesh/)
  })
})
