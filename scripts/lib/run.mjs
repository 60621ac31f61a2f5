// Small process helpers for the scripts.
import { spawn, spawnSync } from 'node:child_process'

export function log(message) {
  process.stdout.write(`[quillfield] ${message}\n`)
}

export function which(command) {
  const result = spawnSync('sh', ['-c', `command -v ${command}`], { encoding: 'utf8' })
  return result.status === 0 ? result.stdout.trim() : null
}

/** Runs a command to completion, inheriting the terminal; resolves to its exit code. */
export function run(command, args, options = {}) {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { stdio: 'inherit', ...options })
    child.on('error', reject)
    child.on('exit', (code, signal) => resolve(code ?? (signal ? 128 : 1)))
  })
}

/** Runs a command and throws when it fails. */
export async function runOrThrow(command, args, options = {}) {
  const code = await run(command, args, options)
  if (code !== 0) throw new Error(`${command} ${args.join(' ')} exited with ${code}`)
}

export function isRoot() {
  return typeof process.getuid === 'function' && process.getuid() === 0
}

let aptUpdated = false

/** Installs Debian packages when running as root; otherwise explains what to install. */
export async function ensureDebianPackages(packages, why) {
  if (!isRoot()) {
    throw new Error(`${why} needs the Debian package(s) ${packages.join(', ')}. Install them with: sudo apt-get install -y ${packages.join(' ')}`)
  }
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  if (!aptUpdated) {
    log('apt-get update')
    await runOrThrow('apt-get', ['update', '-qq'], { env })
    aptUpdated = true
  }
  log(`apt-get install ${packages.join(' ')} (${why})`)
  await runOrThrow('apt-get', ['install', '-y', '-qq', ...packages], { env })
}

export function sleep(ms) {
  return new Promise(resolve => setTimeout(resolve, ms))
}

export function processAlive(pid) {
  try {
    process.kill(pid, 0)
    return true
  }
  catch {
    return false
  }
}

/** Waits until GET <url>/api/health answers 200, or the process exits; false when it never did. */
export async function waitForHealth(url, child, tries = 300) {
  for (let i = 0; i < tries; i++) {
    if (child.exitCode !== null) return false
    try {
      const response = await fetch(`${url}/api/health`)
      if (response.ok) return true
    }
    catch { /* not up yet */ }
    await sleep(100)
  }
  return false
}
