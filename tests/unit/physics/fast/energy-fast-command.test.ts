import { describe, it, expect } from 'vitest'
import { command } from '../../../../cli/commands/energy-fast'
import { UsageError } from '../../../../cli/command'
import { pairSum } from '../../../../shared/physics/energy'
import { relErr, uniform } from './configurations'

function csv(points: Float64Array): Uint8Array {
  const lines = ['x,y']
  for (let i = 0; i < points.length; i += 2) lines.push(`${points[i]},${points[i + 1]}`)
  return new TextEncoder().encode(lines.join('\n') + '\n')
}

describe('energy-fast command', () => {
  const points = uniform(2500, 2, 21)
  const io = { readFile: () => csv(points), writeFile: () => undefined }
  const exact = pairSum({ N: 2500, d: 2, points }, { name: 'log' }, { kind: 'free', d: 2 })

  it('sums the pair energy of a file by the chosen or the requested method', async () => {
    const direct = await command.run({ input: 'points.csv' }, io) as { pairSum: number, method: string, engineVersion: string }
    // the log kernel takes the native kernels (npm test builds them; without them this fails)
    expect(direct.method).toBe('direct-native')
    expect(relErr(direct.pairSum, exact)).toBeLessThanOrEqual(1e-13)
    const wasm = await command.run({ input: 'points.csv', method: 'direct-wasm' }, io) as { pairSum: number, method: string }
    expect(wasm.method).toBe('direct-wasm')
    expect(relErr(wasm.pairSum, exact)).toBeLessThanOrEqual(1e-13)
    expect(direct.engineVersion).toMatch(/\d/)
    const fmm = await command.run({ input: 'points.csv', method: 'fmm2d', tolerance: 1e-8 }, io) as { pairSum: number, method: string, errorBound: number }
    expect(fmm.method).toBe('fmm2d')
    expect(relErr(fmm.pairSum, exact)).toBeLessThanOrEqual(1e-8)
    expect(fmm.errorBound).toBeLessThanOrEqual(1e-8)
  })

  it('rejects an unknown method', async () => {
    await expect(command.run({ input: 'points.csv', method: 'magic' }, io)).rejects.toBeInstanceOf(UsageError)
  })
})
