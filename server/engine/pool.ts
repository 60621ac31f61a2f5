// A pool of worker threads running the SIMD pair kernels (shared/physics/fast/wasm.ts). The
// triangular sum Σ_{i<j} g(x_i − x_j) is cut into row blocks of nearly equal pair counts that depend
// on N only (shared/physics/fast/chunks.ts); block k runs on worker k mod T and the block sums are
// added in block order with Neumaier compensation, so the value is the same to the bit for any number
// of workers and on every run. Without WebAssembly (or without worker threads) the plain TypeScript
// sum of shared/physics/energy.ts is used and the result says so.
import { Worker } from 'node:worker_threads'
import { availableParallelism } from 'node:os'
import type { Geometry, Kernel } from '../../shared/physics/types'
import { EngineInputError } from '../../shared/physics/errors'
import { ENGINE_VERSION } from '../../shared/physics/version'
import { pairSum } from '../../shared/physics/energy'
import { planPairSum } from '../../shared/physics/fast/plan'
import { balancedRowBlocks, sumInOrder } from '../../shared/physics/fast/chunks'
import { compilePairKernels, wasmSimdAvailable } from '../../shared/physics/fast/wasm'
import { directFields } from '../../shared/physics/fast/direct'

export interface FastPairSumResult {
  /** Σ_{i<j} g(x_i − x_j). */
  readonly value: number
  readonly method: 'wasm-simd' | 'ts-direct'
  readonly threads: number
  readonly pairsPerSecond: number
  /** Why the TypeScript path was used, when it was. */
  readonly fallback?: string
  readonly engineVersion: string
}

export interface FastFieldsResult {
  readonly potential: Float64Array
  readonly force: Float64Array
  readonly method: 'wasm-simd' | 'ts-direct'
  readonly threads: number
  readonly fallback?: string
  readonly engineVersion: string
}

export interface PairPoolOptions {
  /** Number of worker threads (default 2, at most the available parallelism unless asked). */
  readonly threads?: number
}

// The worker: plain JavaScript evaluated by worker_threads (no file to resolve after bundling).
const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads')
const x = new WebAssembly.Instance(workerData.module, { env: { abort() { throw new Error('pair kernels aborted') } } }).exports
let n = 0, px = 0, py = 0, pz = 0, out = 0
function load(points, d) {
  n = points.length / d
  const base = Math.ceil(x.heapBase() / 64) * 64
  const need = base + 8 * n * 7 + 256
  if (x.memory.buffer.byteLength < need) x.memory.grow(Math.ceil((need - x.memory.buffer.byteLength) / 65536))
  px = base; py = base + 8 * n; pz = base + 16 * n; out = base + 24 * n
  const f = new Float64Array(x.memory.buffer, base, 3 * n)
  f.fill(0)
  for (let i = 0; i < n; i++) for (let k = 0; k < d; k++) f[k * n + i] = points[i * d + k]
}
function check(v) {
  if (Number.isNaN(v) && x.coincidentI() >= 0) {
    const e = new Error('coincident'); e.indices = [x.coincidentI(), x.coincidentJ()]; throw e
  }
  return v
}
parentPort.on('message', (m) => {
  try {
    if (m.points) load(m.points, m.d)
    if (m.type === 'energy') {
      const values = m.blocks.map(([i0, i1]) => m.kind === 'log'
        ? -0.5 * check(m.d === 3 ? x.energyLog3(px, py, pz, n, i0, i1) : x.energyLog2(px, py, pz, n, i0, i1))
        : check(x.energyPower(px, py, pz, n, i0, i1, m.mode, m.s)))
      parentPort.postMessage({ id: m.id, values })
    }
    else {
      const o = [out, out + 8 * n, out + 16 * n, out + 24 * n]
      const parts = m.blocks.map(([i0, i1]) => {
        if (m.d === 2) check(x.fieldLog2(px, py, n, i0, i1, o[0], o[1], o[2]))
        else check(x.fieldCoulomb3(px, py, pz, n, i0, i1, o[0], o[1], o[2], o[3]))
        const buf = x.memory.buffer
        const potential = new Float64Array(buf, o[0], n).slice(i0, i1)
        const force = new Float64Array((i1 - i0) * m.d)
        for (let k = 0; k < m.d; k++) {
          const axis = new Float64Array(buf, o[k + 1], n)
          for (let i = i0; i < i1; i++) force[(i - i0) * m.d + k] = axis[i]
        }
        return { i0, i1, potential, force }
      })
      parentPort.postMessage({ id: m.id, parts })
    }
  }
  catch (e) {
    parentPort.postMessage({ id: m.id, error: String(e && e.message || e), indices: e && e.indices })
  }
})
`

interface EnergyReply { id: number, values?: number[], parts?: FieldPart[], error?: string, indices?: [number, number] }
interface FieldPart { i0: number, i1: number, potential: Float64Array, force: Float64Array }

interface Pending { resolve: (r: EnergyReply) => void, reject: (e: Error) => void }

class PoolWorker {
  readonly worker: Worker
  private readonly pending = new Map<number, Pending>()
  private next = 0

  constructor(module: WebAssembly.Module) {
    this.worker = new Worker(WORKER_SOURCE, { eval: true, workerData: { module } })
    this.worker.on('message', (r: EnergyReply) => {
      const p = this.pending.get(r.id)
      if (!p) return
      this.pending.delete(r.id)
      if (this.pending.size === 0) this.worker.unref()
      p.resolve(r)
    })
    this.worker.on('error', (e: Error) => {
      for (const p of this.pending.values()) p.reject(e)
      this.pending.clear()
    })
    // after the listeners are attached (attaching one refs the worker again)
    this.worker.unref()
  }

  send(message: Record<string, unknown>): Promise<EnergyReply> {
    const id = this.next++
    this.worker.ref()
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject })
      this.worker.postMessage({ ...message, id })
    })
  }
}

function replyError(r: EnergyReply): Error {
  if (r.indices) return new EngineInputError(`points ${r.indices[0]} and ${r.indices[1]} coincide; the interaction energy is infinite`, { indices: r.indices })
  return new Error(`pair kernel worker failed: ${r.error}`)
}

/** Worker threads with the SIMD kernels; create once, reuse, close when done. */
export class PairPool {
  readonly threads: number
  private readonly workers: PoolWorker[] = []
  /** Set when the pool could not start and every call uses the TypeScript path. */
  readonly fallback?: string

  constructor(options: PairPoolOptions = {}) {
    const t = options.threads ?? Math.min(2, Math.max(1, availableParallelism()))
    if (!Number.isInteger(t) || t < 1) throw new EngineInputError(`the number of threads must be an integer ≥ 1 (got ${t})`)
    this.threads = t
    let reason: string | undefined
    if (!wasmSimdAvailable()) reason = 'WebAssembly with 128-bit SIMD is not available in this runtime'
    else {
      try {
        const module = compilePairKernels()
        for (let k = 0; k < t; k++) this.workers.push(new PoolWorker(module))
      }
      catch (e) {
        reason = `worker threads could not start: ${e instanceof Error ? e.message : String(e)}`
        for (const w of this.workers) void w.worker.terminate()
        this.workers.length = 0
      }
    }
    this.fallback = reason
  }

  /** Σ_{i<j} g(x_i − x_j) for N points stored flat with d coordinates each. */
  async pairSum(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry): Promise<FastPairSumResult> {
    const plan = planPairSum(points, d, kernel, geometry)
    const N = points.length / d
    const pairs = (N * (N - 1)) / 2
    const start = performance.now()
    if (this.fallback !== undefined || N < 2) {
      const value = N < 2 ? 0 : pairSum({ N, d, points }, kernel, geometry)
      const seconds = Math.max(1e-9, (performance.now() - start) / 1000)
      return { value, method: 'ts-direct', threads: 1, pairsPerSecond: pairs / seconds, fallback: this.fallback ?? 'fewer than two points', engineVersion: ENGINE_VERSION }
    }
    const bounds = balancedRowBlocks(N)
    const T = Math.min(this.threads, bounds.length - 1)
    const assigned: number[][] = Array.from({ length: T }, () => [])
    for (let k = 0; k + 1 < bounds.length; k++) assigned[k % T].push(k)
    const replies = await Promise.all(assigned.map((ks, w) => this.workers[w].send({
      type: 'energy',
      points,
      d,
      kind: plan.kind,
      mode: plan.mode,
      s: plan.s,
      blocks: ks.map(k => [bounds[k], bounds[k + 1]]),
    })))
    const parts = new Float64Array(bounds.length - 1)
    replies.forEach((r, w) => {
      if (!r.values) throw replyError(r)
      r.values.forEach((v, m) => {
        parts[assigned[w][m]] = v
      })
    })
    const value = sumInOrder(parts)
    const seconds = Math.max(1e-9, (performance.now() - start) / 1000)
    return { value, method: 'wasm-simd', threads: T, pairsPerSecond: pairs / seconds, engineVersion: ENGINE_VERSION }
  }

  /** Potentials and forces: −log|x| in the plane (d = 2) or 1/|x| in space (d = 3). */
  async fields(points: Float64Array, d: 2 | 3): Promise<FastFieldsResult> {
    planPairSum(points, d, d === 2 ? { name: 'log' } : { name: 'coulomb' }, { kind: 'free', d })
    const N = points.length / d
    if (this.fallback !== undefined || N < 2) {
      const f = directFields(points, d, d === 2 ? { name: 'log' } : { name: 'coulomb' })
      return { ...f, method: 'ts-direct', threads: 1, fallback: this.fallback ?? 'fewer than two points', engineVersion: ENGINE_VERSION }
    }
    const K = Math.min(N, 4 * this.threads)
    const T = Math.min(this.threads, K)
    const assigned: number[][][] = Array.from({ length: T }, () => [])
    for (let k = 0; k < K; k++) assigned[k % T].push([Math.floor((k * N) / K), Math.floor(((k + 1) * N) / K)])
    const replies = await Promise.all(assigned.map((blocks, w) => this.workers[w].send({ type: 'fields', points, d, blocks })))
    const potential = new Float64Array(N)
    const force = new Float64Array(N * d)
    for (const r of replies) {
      if (!r.parts) throw replyError(r)
      for (const part of r.parts) {
        potential.set(part.potential, part.i0)
        force.set(part.force, part.i0 * d)
      }
    }
    return { potential, force, method: 'wasm-simd', threads: T, engineVersion: ENGINE_VERSION }
  }

  /** Stops the workers. */
  async close(): Promise<void> {
    await Promise.all(this.workers.map(w => w.worker.terminate()))
    this.workers.length = 0
  }
}

let shared: PairPool | undefined

/** Σ_{i<j} g(x_i − x_j) on the process-wide pool (two workers unless `threads` is given, which
 *  starts a pool of that size for this call only). */
export async function fastPairSum(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry, options: PairPoolOptions = {}): Promise<FastPairSumResult> {
  if (options.threads !== undefined) {
    const pool = new PairPool(options)
    try {
      return await pool.pairSum(points, d, kernel, geometry)
    }
    finally {
      await pool.close()
    }
  }
  shared ??= new PairPool()
  return shared.pairSum(points, d, kernel, geometry)
}
