import { describe, it, expect } from 'vitest'
import { pairSum } from '../../../../shared/physics/energy'
import { EngineInputError } from '../../../../shared/physics/errors'
import { FMM2D_MIN_N, FMM2D_MIN_N_NATIVE, chooseMethod, fastEnergy, fmm3dMinN, treecodeWins } from '../../../../shared/physics/fast/choose'
import { clustered, relErr, sphere, uniform } from './configurations'

describe('choice of the pair-sum method', () => {
  it('is deterministic and follows N, kernel, geometry and tolerance', () => {
    const free2 = { kind: 'free', d: 2 } as const
    expect(chooseMethod(1000, 2, { name: 'log' }, free2, 1e-10, true, false)).toBe('direct-wasm')
    expect(chooseMethod(1000, 2, { name: 'log' }, free2, 1e-10, false, false)).toBe('direct-ts')
    expect(chooseMethod(1000, 2, { name: 'log' }, free2, 1e-10, true, true)).toBe('direct-native')
    expect(chooseMethod(1000, 3, { name: 'log' }, { kind: 'sphere' }, 1e-10, true, true)).toBe('direct-native')
    // the native kernels sum the log kernel only
    expect(chooseMethod(1000, 2, { name: 'riesz', s: 1 }, free2, 1e-10, true, true)).toBe('direct-wasm')
    // against the faster native direct sum the 2-D FMM starts later
    expect(chooseMethod(FMM2D_MIN_N, 2, { name: 'log' }, free2, 1e-10, true, true)).toBe('direct-native')
    expect(chooseMethod(FMM2D_MIN_N_NATIVE, 2, { name: 'log' }, free2, 1e-10, true, true)).toBe('fmm2d')
    expect(chooseMethod(FMM2D_MIN_N, 2, { name: 'log' }, free2, 1e-10, true, false)).toBe('fmm2d')
    expect(chooseMethod(FMM2D_MIN_N, 1, { name: 'log' }, { kind: 'free', d: 1 }, 1e-10, true, false)).toBe('fmm2d')
    expect(chooseMethod(FMM2D_MIN_N, 2, { name: 'log' }, free2, 1e-15, true, false)).toBe('direct-wasm')
    expect(chooseMethod(FMM2D_MIN_N, 2, { name: 'riesz', s: 1 }, free2, 1e-6, true)).toBe('direct-wasm')
    // tolerance 1e−2 at θ = 0.5, s = 1: (1.5)·0.5^(p+1)/0.5 ≤ 1e−2 first at p = 8, C(11, 3) = 165 terms
    expect(treecodeWins(3000 * 165 + 1, { name: 'coulomb' }, 3, 1e-2)).toBe(true)
    expect(treecodeWins(3000 * 165, { name: 'coulomb' }, 3, 1e-2)).toBe(false)
    expect(chooseMethod(1e6, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, 1e-2, true)).toBe('fmm3d')
    expect(chooseMethod(fmm3dMinN(1e-2) - 1, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, 1e-2, true)).toBe('direct-wasm')
    expect(chooseMethod(fmm3dMinN(1e-4), 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, 1e-4, true)).toBe('fmm3d')
    expect(chooseMethod(fmm3dMinN(1e-6) - 1, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, 1e-6, true)).toBe('direct-wasm')
    expect(chooseMethod(1e6, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, 1e-6, true)).toBe('fmm3d')
    expect(chooseMethod(1e6, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, 1e-12, true)).toBe('direct-wasm')
    // tighter tolerances need larger N before the FMM pays
    for (const [loose, tight] of [[1e-3, 1e-4], [1e-4, 1e-6], [1e-6, 1e-10]]) expect(fmm3dMinN(loose)).toBeLessThanOrEqual(fmm3dMinN(tight))
    expect(chooseMethod(1e6, 3, { name: 'riesz', s: 1 }, { kind: 'sphere' }, 1e-2, true)).toBe('treecode')
    expect(chooseMethod(1e6, 3, { name: 'riesz', s: 1.5 }, { kind: 'free', d: 3 }, 1e-2, true)).toBe('treecode')
    expect(chooseMethod(1e6, 3, { name: 'riesz', s: 1 }, { kind: 'sphere' }, 1e-10, true)).toBe('direct-wasm')
    for (let k = 0; k < 3; k++) expect(chooseMethod(50000, 2, { name: 'log' }, free2, 1e-8)).toBe(chooseMethod(50000, 2, { name: 'log' }, free2, 1e-8))
  })

  it('direct results equal the TypeScript pair sum to 1e−13 and report no truncation error', () => {
    const points = sphere(900, 2)
    const r = fastEnergy(points, 3, { name: 'riesz', s: 1 }, { kind: 'sphere' })
    expect(r.method).toBe('direct-wasm')
    expect(r.errorBound).toBe(0)
    expect(relErr(r.value, pairSum({ N: 900, d: 3, points }, { name: 'riesz', s: 1 }, { kind: 'sphere' }))).toBeLessThanOrEqual(1e-13)
    const t = fastEnergy(points, 3, { name: 'log' }, { kind: 'sphere' }, { method: 'direct-ts' })
    expect(t.method).toBe('direct-ts')
    expect(t.value).toBe(pairSum({ N: 900, d: 3, points }, { name: 'log' }, { kind: 'sphere' }))
  })

  it('a forced fast method meets the tolerance (the line embedded in the plane for the 2-D FMM)', () => {
    const line = uniform(4000, 1, 3)
    const exact = pairSum({ N: 4000, d: 1, points: line }, { name: 'log' }, { kind: 'free', d: 1 })
    const r = fastEnergy(line, 1, { name: 'log' }, { kind: 'free', d: 1 }, { tolerance: 1e-9, method: 'fmm2d' })
    expect(r.method).toBe('fmm2d')
    expect(relErr(r.value, exact)).toBeLessThanOrEqual(1e-9)
    expect(r.errorBound).toBeLessThanOrEqual(1e-9)
    const pts = clustered(800, 3, 4)
    const fm = fastEnergy(pts, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, { tolerance: 1e-5, method: 'fmm3d' })
    expect(fm.method).toBe('fmm3d')
    expect(fm.errorBound).toBeLessThanOrEqual(1e-5)
    expect(relErr(fm.value, pairSum({ N: 800, d: 3, points: pts }, { name: 'coulomb' }, { kind: 'free', d: 3 }))).toBeLessThanOrEqual(1e-5)
    expect(() => fastEnergy(pts, 3, { name: 'riesz', s: 1.5 }, { kind: 'free', d: 3 }, { method: 'fmm3d' })).toThrow(EngineInputError)
    const tc = fastEnergy(pts, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, { tolerance: 1e-5, method: 'treecode' })
    expect(relErr(tc.value, pairSum({ N: 800, d: 3, points: pts }, { name: 'coulomb' }, { kind: 'free', d: 3 }))).toBeLessThanOrEqual(1e-5)
    expect(tc.engineVersion).toMatch(/\d/)
  })

  it('rejects the FMM for kernels it does not sum, and bad tolerances', () => {
    expect(() => fastEnergy(uniform(10, 2, 1), 2, { name: 'riesz', s: 1 }, { kind: 'free', d: 2 }, { method: 'fmm2d' })).toThrow(EngineInputError)
    expect(() => fastEnergy(uniform(10, 2, 1), 2, { name: 'log' }, { kind: 'free', d: 2 }, { tolerance: 2 })).toThrow(/tolerance/)
  })
})
