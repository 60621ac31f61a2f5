// energy-fast: the pair sum Σ_{i<j} g of each configuration by the direct SIMD kernels or a fast method
// (2-D log FMM, tree code), chosen from N and the tolerance, with the truncation bound.
import type { FastMethod } from '../../shared/physics/fast/choose'
import { fastEnergy } from '../../shared/physics/fast/choose'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { EngineCommand } from '../command'
import { UsageError } from '../command'
import { inputOptions, loadInput, perConfiguration } from '../input'
import { geometryOptions, numberOption, pointDimension, readKernel, stringOption } from '../setting'

const METHODS: FastMethod[] = ['direct-native', 'direct-wasm', 'direct-ts', 'fmm2d', 'fmm3d', 'treecode']

export const command: EngineCommand = {
  name: 'energy-fast',
  summary: 'pair sum Σ_{i<j} g by direct sums (native vector kernels, WebAssembly SIMD or TypeScript) or a fast method chosen from N and the tolerance, with its error bound',
  options: [
    ...inputOptions,
    ...geometryOptions,
    { name: 'tolerance', type: 'number', description: 'requested relative error', default: 1e-10 },
    { name: 'method', type: 'string', description: `force a method: ${METHODS.join(', ')}` },
  ],
  async run(args, io) {
    const input = await loadInput(args, io)
    const { geometry, ensemble } = input
    if (geometry.kind === 'torus') throw new UsageError('energy-fast sums free-space and sphere pair energies; use energy for the torus')
    const d = pointDimension(geometry)
    const kernel = readKernel(args, geometry)
    const tolerance = numberOption(args, 'tolerance') ?? 1e-10
    const m = stringOption(args, 'method')
    if (m !== undefined && !METHODS.includes(m as FastMethod)) throw new UsageError(`--method must be one of ${METHODS.join(', ')} (got ${m})`)
    const method = m as FastMethod | undefined
    const rows = input.selected.map((k) => {
      const conf = ensemble.configurations[k]!
      const r = fastEnergy(conf.points, d, kernel, geometry, { tolerance, method })
      return { N: conf.N, d: conf.d, pairSum: r.value, method: r.method, errorBound: r.errorBound, parameters: r.parameters }
    })
    return perConfiguration(input, { engineVersion: ENGINE_VERSION, geometry, kernel, tolerance }, rows)
  },
}
