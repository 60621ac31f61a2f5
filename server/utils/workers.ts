// Worker-thread pools (piscina) that run the engine off the request thread. The worker entry
// points in server/workers/ are bundled next to the built server (see nuxt.config.ts) into
// <server dir>/workers/<name>.mjs; NUXT_WORKERS_DIR overrides where they are looked for.
import { existsSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { Piscina } from 'piscina'

const pools = new Map<string, Piscina>()

export function workersDirectory(): string {
  const configured = String(useRuntimeConfig().workersDir || '')
  if (configured) return resolve(configured)
  return join(dirname(process.argv[1] ?? '.'), 'workers')
}

export function useWorkerPool(name: string): Piscina {
  let pool = pools.get(name)
  if (!pool) {
    const file = join(workersDirectory(), `${name}.mjs`)
    if (!existsSync(file)) {
      throw createError({ statusCode: 503, statusMessage: `The ${name} worker is not built (${file} is missing); run the build again.` })
    }
    pool = new Piscina({ filename: pathToFileURL(file).href, minThreads: 0, maxThreads: 2, idleTimeout: 30_000 })
    pools.set(name, pool)
  }
  return pool
}

export async function closeWorkerPools(): Promise<void> {
  await Promise.all([...pools.values()].map(pool => pool.close()))
  pools.clear()
}
