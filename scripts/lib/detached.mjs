// A service the project runs as a detached Node process of its own (the object-store fake, the
// SMTP fake): a pid file, a log file, and the same idempotent status/start/stop as every service.
import { spawn } from 'node:child_process'
import { existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { dirname } from 'node:path'
import { log, processAlive, sleep } from './run.mjs'

/**
 * @param {{ name: string, label: string, pidFile: string, logFile: string, local: () => boolean,
 *   command: () => string[], answers: () => Promise<boolean>, detail: () => string, prepare?: () => void }} spec
 */
export function detachedService(spec) {
  function readPid() {
    if (!existsSync(spec.pidFile)) return null
    const pid = Number(readFileSync(spec.pidFile, 'utf8').trim())
    return Number.isInteger(pid) && pid > 0 ? pid : null
  }
  return {
    name: spec.name,
    async status() {
      const pid = readPid()
      const running = pid !== null && processAlive(pid) && await spec.answers()
      return { running, pid: running ? pid : null, detail: running ? spec.detail() : 'stopped' }
    },
    async start() {
      if (!spec.local()) return false
      if ((await this.status()).running) return false
      mkdirSync(dirname(spec.pidFile), { recursive: true })
      spec.prepare?.()
      const out = openSync(spec.logFile, 'a')
      const child = spawn(process.execPath, spec.command(), { detached: true, stdio: ['ignore', out, out] })
      child.unref()
      writeFileSync(spec.pidFile, String(child.pid))
      for (let i = 0; i < 200; i++) {
        if (await spec.answers()) {
          log(`${spec.label} is up: ${spec.detail()} (pid ${child.pid})`)
          return true
        }
        if (child.exitCode !== null) break
        await sleep(100)
      }
      throw new Error(`the ${spec.label} did not start; see ${spec.logFile}`)
    },
    async stop() {
      const pid = readPid()
      if (pid === null || !processAlive(pid)) return false
      process.kill(pid, 'SIGTERM')
      for (let i = 0; i < 100 && processAlive(pid); i++) await sleep(50)
      if (processAlive(pid)) process.kill(pid, 'SIGKILL')
      rmSync(spec.pidFile, { force: true })
      log(`${spec.label} stopped`)
      return true
    },
  }
}

/** True when a GET of the address answers (with a status below `below`) within a second. */
export async function answersAt(url, below = 500) {
  try {
    const response = await fetch(url, { signal: AbortSignal.timeout(1000) })
    return response.status < below
  }
  catch {
    return false
  }
}
