// Delaunay neighbours, ψ₆ and Voronoi cells on configurations whose answers follow from geometry.
import { describe, it, expect } from 'vitest'
import { bondOrientationalOrder, localBondOrder } from '../../../../shared/physics/statistics/bond-order'
import { tessellate } from '../../../../shared/physics/statistics/delaunay'
import { voronoiAreas, voronoiCellAreas } from '../../../../shared/physics/statistics/voronoi'
import { EngineInputError } from '../../../../shared/physics/errors'
import { createTestRng, poissonBox, triangularPatch } from '../../../support/stat-samples'

describe('triangular lattice (geometry)', () => {
  const s = 0.7
  const pts = triangularPatch(s, 6)
  const N = pts.length / 2

  it('every interior point has 6 Delaunay neighbours at distance s and |ψ₆| = 1', () => {
    const t = tessellate(pts)
    const local = localBondOrder(pts, undefined)
    let interior = 0
    for (let i = 0; i < N; i++) {
      if (Math.hypot(pts[2 * i], pts[2 * i + 1]) > 6 - 2 * s) continue
      interior++
      expect(t.neighbours[i].length).toBe(6)
      for (let k = 0; k < 6; k++) expect(Math.hypot(t.displacements[i][2 * k], t.displacements[i][2 * k + 1])).toBeCloseTo(s, 12)
      expect(Math.hypot(local.re[i], local.im[i])).toBeCloseTo(1, 12)
    }
    expect(interior).toBeGreaterThan(150)
  })

  it('a rotated lattice keeps |ψ₆| = 1 with the phase e^{6iφ}', () => {
    const phi = 0.3
    const rot = new Float64Array(pts.length)
    for (let i = 0; i < N; i++) {
      rot[2 * i] = Math.cos(phi) * pts[2 * i] - Math.sin(phi) * pts[2 * i + 1]
      rot[2 * i + 1] = Math.sin(phi) * pts[2 * i] + Math.cos(phi) * pts[2 * i + 1]
    }
    const table = bondOrientationalOrder([{ N, d: 2, points: rot }], { window: { kind: 'ball', center: [0, 0], radius: 6 - 2 * s }, uniform: Math.random })
    expect(table.summary.global).toBeCloseTo(1, 12)
    expect(table.summary.meanLocal).toBeCloseTo(1, 12)
    const centre = table.rows.find(r => Math.hypot(r.x, r.y) < 1e-9)
    expect(centre?.re).toBeCloseTo(Math.cos(6 * phi), 12)
    expect(centre?.im).toBeCloseTo(Math.sin(6 * phi), 12)
  })

  it('interior Voronoi cells are regular hexagons of area (√3/2) s²; hull cells are dropped and counted', () => {
    const { areas, dropped } = voronoiAreas(pts)
    const t = tessellate(pts)
    const hull = t.onHull.reduce((a, b) => a + b, 0)
    expect(dropped).toBe(hull)
    for (let i = 0; i < N; i++) {
      if (t.onHull[i] === 1) expect(Number.isNaN(areas[i])).toBe(true)
      else if (Math.hypot(pts[2 * i], pts[2 * i + 1]) < 6 - 2 * s) expect(areas[i]).toBeCloseTo((Math.sqrt(3) / 2) * s * s, 12)
    }
    const table = voronoiCellAreas([{ N, d: 2, points: pts }], { window: { kind: 'ball', center: [0, 0], radius: 6 }, uniform: Math.random })
    expect(table.summary.dropped).toBeGreaterThanOrEqual(hull)
    expect(table.summary.meanArea).toBeCloseTo((Math.sqrt(3) / 2) * s * s, 12)
  })
})

describe('periodic box', () => {
  it('Voronoi cells of a Poisson sample tile the box: areas sum to L² and none is dropped', () => {
    const rng = createTestRng(51)
    const L = 5
    const p = poissonBox(4, L, 2, rng)
    const { areas, dropped } = voronoiAreas(p, { kind: 'torus', L })
    expect(dropped).toBe(0)
    expect(areas.reduce((a, b) => a + b, 0)).toBeCloseTo(L * L, 9)
  })

  it('every point has at least 3 Delaunay neighbours and their mean number is 6 (Euler\'s formula on the torus)', () => {
    const rng = createTestRng(52)
    const p = poissonBox(4, 5, 2, rng)
    const t = tessellate(p, 5)
    const degrees = t.neighbours.map(n => n.length)
    expect(Math.min(...degrees)).toBeGreaterThanOrEqual(3)
    expect(degrees.reduce((a, b) => a + b, 0) / degrees.length).toBeCloseTo(6, 12)
  })
})

describe('bad input', () => {
  it('coincident points and collinear points are reported', () => {
    expect(() => tessellate(Float64Array.from([0, 0, 1, 0, 0, 1, 1, 0]))).toThrow(EngineInputError)
    expect(() => tessellate(Float64Array.from([0, 0, 1, 0, 2, 0]))).toThrow(/one line/)
    try {
      bondOrientationalOrder([{ N: 4, d: 2, points: Float64Array.from([0, 0, 1, 0, 0, 1, 1, 0]) }], { uniform: Math.random })
      expect.unreachable()
    }
    catch (e) {
      expect((e as EngineInputError).where.configuration).toBe(0)
      expect((e as EngineInputError).where.index).toBe(3)
    }
  })
})
