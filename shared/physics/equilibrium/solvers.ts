// Registers the numerical equilibrium solvers with equilibriumMeasure(): the 1-D log-gas with a
// general potential (numerical-line.ts) and the 2-D log kernel with a radial potential
// (radial-plane.ts). Import this module once wherever equilibrium measures are requested.
import { registerNumericalSolver } from './index'
import type { EquilibriumRequest } from './index'
import { solveLineEquilibrium } from './numerical-line'
import { solveRadialPlaneEquilibrium } from './radial-plane'

let registered = false

export function registerEngineSolvers(): void {
  if (registered) return
  registered = true
  registerNumericalSolver((request: EquilibriumRequest) => {
    const { d, kernel, potential, geometry } = request
    if (geometry.kind !== 'free' || kernel.name !== 'log' || !potential) return undefined
    if (d === 1) return solveLineEquilibrium(potential)
    if (d === 2 && potential.radial) return solveRadialPlaneEquilibrium(potential)
    return undefined
  })
}

registerEngineSolvers()
