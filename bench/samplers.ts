// Benchmarks of the samplers and statistics, as ratios against baselines measured in the same run:
//   Ginibre: the Hessenberg model vs the full complex matrix (both exact; same law)
//   MCMC: per-move energy differences (O(N)) vs recomputing the whole energy for every move
//   pair correlation: the cell list vs a direct O(N²) distance histogram
import { pairSum } from '../shared/physics/energy'
import { quadraticPotential } from '../shared/physics/potentials/presets'
import { createRng } from '../shared/physics/random'
import { sampleBetaHermite } from '../shared/physics/samplers/beta-ensembles'
import { sampleGinibre } from '../shared/physics/samplers/ginibre'
import { runMcmc } from '../shared/physics/samplers/mcmc'
import { pairCorrelation } from '../shared/physics/statistics/pair-correlation'

function seconds<T>(f: () => T): [T, number] {
  const t = performance.now()
  const v = f()
  return [v, (performance.now() - t) / 1000]
}

export function benchSamplersAndStatistics(): void {
  console.log('\n6. samplers and statistics')
  const rng = createRng('bench')
  for (const N of [200, 400]) {
    const [, tH] = seconds(() => sampleGinibre({ N, model: 'hessenberg' }, rng))
    const [, tF] = seconds(() => sampleGinibre({ N, model: 'full' }, rng))
    console.log(`  Ginibre N = ${N}: Hessenberg model ${tH.toFixed(3)} s, full matrix ${tF.toFixed(3)} s, ratio ${(tF / tH).toFixed(1)}×`)
  }
  const [, tB] = seconds(() => sampleBetaHermite({ N: 5000, beta: 2 }, rng))
  console.log(`  β-Hermite tridiagonal model N = 5000: ${tB.toFixed(3)} s per sample`)

  const N = 200
  const potential = quadraticPotential(1, 2)
  const sweeps = 200
  const [, tM] = seconds(() => runMcmc({ model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential, beta: 2 }, N, sweeps, burnIn: 0, thin: 0 }, { rng }))
  const start = sampleGinibre({ N }, rng).configuration
  const reps = 20
  const [, tE] = seconds(() => {
    for (let k = 0; k < reps; k++) pairSum(start, { name: 'log' }, { kind: 'free', d: 2 })
  })
  const movesPerSecond = (sweeps * N) / tM
  const recomputePerSecond = reps / tE
  console.log(`  MCMC N = ${N}: ${movesPerSecond.toExponential(3)} moves/s with O(N) updates; recomputing H per move would allow ${recomputePerSecond.toExponential(3)} moves/s; ratio ${(movesPerSecond / recomputePerSecond).toFixed(0)}×`)

  const configs = Array.from({ length: 4 }, () => sampleGinibre({ N: 1000 }, rng).configuration)
  const rmax = 0.15
  const bins = 15
  const [, tG] = seconds(() => pairCorrelation(configs, { window: { kind: 'ball', center: [0, 0], radius: 0.9 }, bins, rmax, uniform: () => rng.uniform(), replicates: 50 }))
  const [, tD] = seconds(() => {
    for (const c of configs) {
      const h = new Float64Array(bins)
      for (let i = 0; i < c.N; i++) {
        for (let j = i + 1; j < c.N; j++) {
          const r = Math.hypot(c.points[2 * i] - c.points[2 * j], c.points[2 * i + 1] - c.points[2 * j + 1])
          if (r < rmax) h[Math.floor((r / rmax) * bins)]++
        }
      }
    }
  })
  console.log(`  pair correlation, 4 × N = 1000: cell list with edge correction and bootstrap ${tG.toFixed(3)} s, direct O(N²) histogram alone ${tD.toFixed(3)} s, ratio ${(tD / tG).toFixed(1)}×`)
}
