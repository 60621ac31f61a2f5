// Benchmarks of the pair sums, printed as ratios measured in the same run:
//   1. direct sums: plain TypeScript loop vs SIMD WebAssembly (one thread, and the worker pool), and
//      for the log kernel the native vector kernels (one and two threads) against the target
//   2. the 2-D log FMM vs the fastest direct sum at N = 1e4 and 1e5 (1e6 with --large), with the
//      measured relative error
//   3. the 3-D Coulomb tree code vs the direct sum (information), and the 3-D Coulomb FMM vs the SIMD
//      direct sum at N = 1e4 and 1e5 (1e6 with --large, no reference there), tolerances 1e−3 and 1e−6,
//      with the measured error
//   4. a NumPy/SciPy peer (scipy.spatial.distance.pdist), when python3 has numpy and scipy
//   5. torus energies (Ewald): the sum over wave vectors vs the spline mesh, 2-D log and 3-D Coulomb,
//      with the difference of the two and their estimates, the growth of the mesh route with N, and
//      the cost of the forces
//   6. samplers and statistics (bench/samplers.ts)
// Usage: npx tsx bench/run.ts [--large] [--torus-only]
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { pairSum, pairSumNaive } from '../shared/physics/energy'
import { fmm2dEnergy } from '../shared/physics/fast/fmm2d'
import { fmm3dEnergy } from '../shared/physics/fast/fmm3d'
import { nativeLogKernels, nativeLogSquaredSum } from '../shared/physics/fast/native'
import { treecodeEnergy } from '../shared/physics/fast/treecode'
import { PairKernels, wasmPairSum } from '../shared/physics/fast/wasm'
import { PairPool } from '../server/engine/pool'
import { torusEnergy, torusEnergyAndGradient } from '../shared/physics/torus/ewald'
import { cubicLattice } from '../shared/physics/torus/lattice'
import { benchSamplersAndStatistics } from './samplers'

const large = process.argv.includes('--large')

function uniform(N: number, d: number, seed: number): Float64Array {
  let a = seed >>> 0
  const p = new Float64Array(N * d)
  for (let k = 0; k < p.length; k++) {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    p[k] = ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
  return p
}

function timed<T>(f: () => T): [T, number] {
  const t = performance.now()
  const v = f()
  return [v, (performance.now() - t) / 1000]
}

async function timedAsync<T>(f: () => Promise<T>): Promise<[T, number]> {
  const t = performance.now()
  const v = await f()
  return [v, (performance.now() - t) / 1000]
}

const fmt = (x: number): string => x.toExponential(3)
const free2 = { kind: 'free', d: 2 } as const
const free3 = { kind: 'free', d: 3 } as const

async function main(): Promise<void> {
  const pool = new PairPool({ threads: 2 })
  const native = nativeLogKernels()
  console.log(`pool: ${pool.threads} worker threads${pool.fallback ? ` (fallback: ${pool.fallback})` : ''}\n`)

  console.log('1. direct pair sums, pairs per second')
  for (const [label, d, kernel, geometry] of [
    ['log, d = 2', 2, { name: 'log' }, free2],
    ['coulomb, d = 3', 3, { name: 'coulomb' }, free3],
  ] as const) {
    const N = 20000
    const points = uniform(N, d, 1)
    const pairs = (N * (N - 1)) / 2
    const conf = { N, d, points }
    const [naive, tNaive] = timed(() => pairSumNaive(conf, kernel, geometry))
    const [ts, tTs] = timed(() => pairSum(conf, kernel, geometry))
    const kernels = new PairKernels()
    wasmPairSum(points, d, kernel, geometry, kernels)
    const [w1, tW1] = timed(() => wasmPairSum(points, d, kernel, geometry, kernels))
    await pool.pairSum(points, d, kernel, geometry)
    const [w2, tW2] = await timedAsync(() => pool.pairSum(points, d, kernel, geometry))
    console.log(`  ${label}, N = ${N}:`)
    console.log(`    plain TS loop (pairSumNaive)     ${fmt(pairs / tNaive)}`)
    console.log(`    TS compensated (pairSum)         ${fmt(pairs / tTs)}`)
    console.log(`    WASM SIMD, 1 thread              ${fmt(pairs / tW1)}   ratio to plain TS ${(tNaive / tW1).toFixed(1)}×`)
    console.log(`    WASM SIMD, ${w2.threads} worker threads       ${fmt(pairs / tW2)}   ratio to plain TS ${(tNaive / tW2).toFixed(1)}×`)
    console.log(`    agreement: |wasm − ts|/|ts| = ${fmt(Math.abs(w1 - ts) / Math.abs(ts))}, naive ${fmt(Math.abs(naive - ts) / Math.abs(ts))}, pool = 1 thread: ${w2.value === w1}`)
    if (kernel.name !== 'log') continue
    if (!native) {
      console.log('    native kernels: not built (npm run build:native), skipped')
      continue
    }
    // a larger N for the native kernels, whose 2-thread time at N = 2e4 is a few milliseconds
    const M = 100000
    const big = uniform(M, 2, 6)
    const bigPairs = (M * (M - 1)) / 2
    const tsAtM = tNaive * (bigPairs / pairs)
    const [n1, tN1] = timed(() => -0.5 * nativeLogSquaredSum(native, big, 2, 1))
    const [n2, tN2] = timed(() => -0.5 * nativeLogSquaredSum(native, big, 2, 2))
    const [w3, tW3] = await timedAsync(() => pool.pairSum(big, 2, kernel, geometry))
    const rate = bigPairs / tN2
    console.log(`    native ${native.isa}, 1 thread (N = ${M})   ${fmt(bigPairs / tN1)}   ratio to plain TS ${(tsAtM / tN1).toFixed(1)}×, to WASM pool ${(tW3 / tN1).toFixed(2)}×`)
    console.log(`    native ${native.isa}, 2 threads (N = ${M})  ${fmt(rate)}   ratio to plain TS ${(tsAtM / tN2).toFixed(1)}×, to WASM pool ${(tW3 / tN2).toFixed(2)}×, scaling ${(tN1 / tN2).toFixed(2)}×`)
    console.log(`    target ≥ 8e9 log pairs/s on 2 cores: ${rate >= 8e9 ? 'met' : 'NOT met'}; agreement |native − wasm pool|/|·| = ${fmt(Math.abs(n2 - w3.value) / Math.abs(w3.value))}, 1 thread = 2 threads: ${n1 === n2}`)
    console.log('    (plain TS at this N scaled from its N = 2e4 time by the number of pairs)')
  }

  console.log(`\n2. 2-D log FMM vs the fastest direct sum (${native ? `native ${native.isa}, ${native.threads} threads` : 'WASM worker pool'}), tolerance 1e−10`)
  const fastestLog = async (points: Float64Array): Promise<{ value: number }> => native ? { value: -0.5 * nativeLogSquaredSum(native, points, 2) } : pool.pairSum(points, 2, { name: 'log' }, free2)
  for (const N of large ? [10000, 100000, 1000000] : [10000, 100000]) {
    const points = uniform(N, 2, 2)
    const [direct, tD] = await timedAsync(() => fastestLog(points))
    const [fmm, tF] = timed(() => fmm2dEnergy(points, { tolerance: 1e-10 }))
    const err = Math.abs(fmm.value - direct.value) / Math.abs(direct.value)
    console.log(`  N = ${N}: direct ${tD.toFixed(3)} s, FMM ${tF.toFixed(3)} s (orders ≤ ${fmm.parameters.order}, mean ${(fmm.parameters.meanOrder ?? 0).toFixed(1)}), speed-up ${(tD / tF).toFixed(2)}×, measured error ${fmt(err)}, bound ${fmt(fmm.errorBound)}`)
  }

  console.log('\n3. 3-D Coulomb tree code vs direct SIMD (worker pool), tolerance 1e−4')
  {
    const N = 20000
    const points = uniform(N, 3, 3)
    const [direct, tD] = await timedAsync(() => pool.pairSum(points, 3, { name: 'coulomb' }, free3))
    const [tc, tT] = timed(() => treecodeEnergy(points, 3, { name: 'coulomb' }, free3, { tolerance: 1e-4 }))
    console.log(`  N = ${N}: direct ${tD.toFixed(3)} s, tree code ${tT.toFixed(3)} s (p = ${tc.parameters.order}), ratio ${(tD / tT).toFixed(3)}×, measured error ${fmt(Math.abs(tc.value - direct.value) / direct.value)}, bound ${fmt(tc.errorBound)}`)
  }

  console.log('\n3b. 3-D Coulomb FMM vs direct SIMD (1 thread and worker pool), tolerances 1e−3 and 1e−6')
  await bench3dFmm(pool)

  console.log('\n4. NumPy/SciPy peer (pdist), log kernel, d = 2')
  let havePy = true
  try {
    execFileSync('python3', ['-c', 'import numpy, scipy'], { stdio: 'ignore' })
  }
  catch {
    havePy = false
  }
  if (!havePy) {
    console.log('  skipped: python3 with numpy and scipy is not available (python3 -c "import numpy, scipy" failed)')
  }
  else {
    const N = 8000
    const points = uniform(N, 2, 4)
    const dir = mkdtempSync(join(tmpdir(), 'quillfield-bench-'))
    try {
      const file = join(dir, 'points.f64')
      writeFileSync(file, new Uint8Array(points.buffer))
      const out = JSON.parse(execFileSync('python3', [join(import.meta.dirname, 'peer_pairs.py'), file, String(N), '2'], { encoding: 'utf8' })) as { value: number, pairsPerSecond: number }
      await pool.pairSum(points, 2, { name: 'log' }, free2)
      const [w, tW] = await timedAsync(() => pool.pairSum(points, 2, { name: 'log' }, free2))
      const pairs = (N * (N - 1)) / 2
      console.log(`  N = ${N}: SciPy ${fmt(out.pairsPerSecond)} pairs/s, WASM pool ${fmt(pairs / tW)} pairs/s, ratio ${((pairs / tW) / out.pairsPerSecond).toFixed(1)}×, |Δ|/|E| = ${fmt(Math.abs(out.value - w.value) / Math.abs(w.value))}`)
      if (native) {
        const [v, tN] = timed(() => -0.5 * nativeLogSquaredSum(native, points, 2))
        console.log(`  N = ${N}: native ${native.isa} (${native.threads} threads) ${fmt(pairs / tN)} pairs/s, ratio to SciPy ${((pairs / tN) / out.pairsPerSecond).toFixed(1)}×, |Δ|/|E| = ${fmt(Math.abs(out.value - v) / Math.abs(v))}`)
      }
    }
    finally {
      rmSync(dir, { recursive: true, force: true })
    }
  }
  await pool.close()
  benchTorus()
  benchSamplersAndStatistics()
}

/** Torus energies by the two reciprocal routes (one thread), uniform points at density 1. */
function benchTorus(): void {
  console.log('\n5. torus energies (Ewald, tolerance 1e−13): wave vectors vs spline mesh, one thread')
  const cases: Array<[2 | 3, number[], number]> = [[2, large ? [1000, 10000, 30000, 100000, 1000000] : [1000, 10000, 30000, 100000], 30000], [3, large ? [1000, 10000, 100000] : [1000, 10000], 5000]]
  for (const [d, sizes, modesUpTo] of cases) {
    let last: [number, number] | undefined
    for (const N of sizes) {
      const L = Math.pow(N, 1 / d)
      const points = uniform(N, d, 11).map(v => v * L)
      const lattice = cubicLattice(d, L)
      const [mesh, tM] = timed(() => torusEnergy(lattice, points, { reciprocal: 'mesh' }))
      const m = mesh.parameters.mesh
      let line = `  d = ${d}, N = ${N}: mesh ${tM.toFixed(3)} s (${m?.sizes.join('×')}, order ${m?.splineOrder}, α = ${mesh.parameters.alpha.toFixed(2)}), estimate ${fmt(mesh.errorEstimate / Math.abs(mesh.value))} relative`
      if (N <= modesUpTo) {
        const [modes, tW] = timed(() => torusEnergy(lattice, points, { reciprocal: 'modes' }))
        line += `; wave vectors ${tW.toFixed(3)} s, ratio ${(tW / tM).toFixed(2)}×, |Δ|/|E| = ${fmt(Math.abs(modes.value - mesh.value) / Math.abs(mesh.value))} (estimates ${fmt((modes.errorEstimate + mesh.errorEstimate) / Math.abs(mesh.value))})`
      }
      if (last) line += `; time grows as N^${(Math.log(tM / last[1]) / Math.log(N / last[0])).toFixed(2)}`
      console.log(line)
      last = [N, tM]
      if (N === sizes[sizes.length - 1]) {
        const [, tG] = timed(() => torusEnergyAndGradient(lattice, points, { reciprocal: 'mesh' }))
        console.log(`    energy and forces (closed form) on the mesh: ${tG.toFixed(3)} s, ${(tG / tM).toFixed(2)}× the energy alone`)
      }
    }
  }
}

/** The 3-D Coulomb FMM against the SIMD direct sum, times measured in the same run. */
export async function bench3dFmm(pool: PairPool, sizes = large ? [10000, 100000, 1000000] : [10000, 100000], tolerances = [1e-3, 1e-6]): Promise<void> {
  const kernels = new PairKernels()
  for (const N of sizes) {
    const points = uniform(N, 3, 5)
    const reference = N > 100000
      ? undefined
      : { one: timed(() => wasmPairSum(points, 3, { name: 'coulomb' }, free3, kernels)), pool: await timedAsync(() => pool.pairSum(points, 3, { name: 'coulomb' }, free3)) }
    if (reference) console.log(`  N = ${N}: direct 1 thread ${reference.one[1].toFixed(3)} s, pool ${reference.pool[1].toFixed(3)} s`)
    for (const tolerance of tolerances) {
      const [fmm, tF] = timed(() => fmm3dEnergy(points, { tolerance }))
      const head = `    tolerance ${tolerance}: FMM ${tF.toFixed(3)} s (orders ≤ ${fmm.order}, mean ${(fmm.parameters.meanOrder ?? 0).toFixed(1)}, θ = ${fmm.parameters.theta}, ${fmm.parameters.cellInteractions} far cell pairs expanded), bound ${fmt(fmm.errorBound)}`
      if (!reference) {
        console.log(`${head}; no direct reference at N = ${N}`)
        continue
      }
      const [d1, t1] = reference.one
      const [d2, t2] = reference.pool
      console.log(`${head}; ratio direct/FMM ${(t1 / tF).toFixed(3)} (1 thread), ${(t2 / tF).toFixed(3)} (pool), measured error ${fmt(Math.abs(fmm.value - d1) / d1)} (pool ${fmt(Math.abs(fmm.value - d2.value) / d2.value)})`)
    }
  }
}

if (process.argv.includes('--torus-only')) benchTorus()
else if (!process.argv.includes('--fmm3d-only')) await main()
