// The computation runner for the API and browser tests: a second instance of the built server
// with NUXT_RUN_JOBS=true, started by the tests that need computations to run (the main test server
// only answers requests), so that a test can stop it mid-job and start it again.
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { join } from 'node:path'

export interface Runner {
  /** Stops it as a crash would: no chance to tidy up. */
  kill(): Promise<void>
  stop(): Promise<void>
}

const port = Number(process.env.QF_TEST_PORT ?? 3100) + 20

async function exited(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return
  await new Promise<void>(resolve => child.once('exit', () => resolve()))
}

export async function startRunner(): Promise<Runner> {
  const child = spawn(process.execPath, [join(process.cwd(), '.output', 'server', 'index.mjs')], {
    env: { ...process.env, NUXT_RUN_JOBS: 'true', HOST: '127.0.0.1', PORT: String(port), NITRO_HOST: '127.0.0.1', NITRO_PORT: String(port) },
    stdio: 'ignore',
  })
  for (let i = 0; i < 300; i++) {
    if (child.exitCode !== null) throw new Error('the computation runner exited at start')
    const up = await fetch(`http://127.0.0.1:${port}/api/health`).then(r => r.ok, () => false)
    if (up) break
    await new Promise(resolve => setTimeout(resolve, 100))
  }
  return {
    async kill() {
      child.kill('SIGKILL')
      await exited(child)
    },
    async stop() {
      child.kill('SIGTERM')
      await exited(child)
    },
  }
}
