// The SMTP fake run by the project on 127.0.0.1 (scripts/smtp-fake.mjs), messages under .data/mail.
import { spawn } from 'node:child_process'
import { existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { dataDir, mail, root } from './config.mjs'
import { log, processAlive, sleep } from './run.mjs'

const base = join(dataDir, 'mail')
const paths = { pid: join(base, 'mailbox.pid'), log: join(base, 'mailbox.log') }

function readPid() {
  if (!existsSync(paths.pid)) return null
  const pid = Number(readFileSync(paths.pid, 'utf8').trim())
  return Number.isInteger(pid) && pid > 0 ? pid : null
}

async function answers() {
  try {
    const response = await fetch(`http://127.0.0.1:${mail.inboxPort}/`, { signal: AbortSignal.timeout(1000) })
    return response.ok
  }
  catch {
    return false
  }
}

export const mailbox = {
  name: 'mail',
  async status() {
    const pid = readPid()
    const running = pid !== null && processAlive(pid) && await answers()
    return { running, pid: running ? pid : null, detail: running ? `SMTP 127.0.0.1:${mail.port}, inbox http://127.0.0.1:${mail.inboxPort}` : 'stopped' }
  },
  async start() {
    if (!mail.local) return false
    if ((await this.status()).running) return false
    mkdirSync(base, { recursive: true })
    const out = openSync(paths.log, 'a')
    const child = spawn(process.execPath, [join(root, 'scripts', 'smtp-fake.mjs'), String(mail.port), String(mail.inboxPort), base], {
      detached: true,
      stdio: ['ignore', out, out],
    })
    child.unref()
    writeFileSync(paths.pid, String(child.pid))
    for (let i = 0; i < 200; i++) {
      if (await answers()) {
        log(`SMTP fake is up on 127.0.0.1:${mail.port}, inbox on ${mail.inboxPort} (pid ${child.pid})`)
        return true
      }
      if (child.exitCode !== null) break
      await sleep(100)
    }
    throw new Error(`the SMTP fake did not start; see ${paths.log}`)
  },
  async stop() {
    const pid = readPid()
    if (pid === null || !processAlive(pid)) return false
    process.kill(pid, 'SIGTERM')
    for (let i = 0; i < 100 && processAlive(pid); i++) await sleep(50)
    if (processAlive(pid)) process.kill(pid, 'SIGKILL')
    rmSync(paths.pid, { force: true })
    log('SMTP fake stopped')
    return true
  },
}
