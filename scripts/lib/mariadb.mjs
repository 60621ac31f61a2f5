// MariaDB from Debian, run by the project with a data directory under .data/ and bound to 127.0.0.1.
import { spawn, spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, openSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { dataDir, db } from './config.mjs'
import { ensureDebianPackages, isRoot, log, processAlive, sleep, which } from './run.mjs'

const base = join(dataDir, 'mariadb')
const paths = {
  data: join(base, 'data'),
  socket: join(base, 'mariadb.sock'),
  pid: join(base, 'mariadb.pid'),
  log: join(base, 'mariadb.log'),
}

function client(args, input) {
  return spawnSync('mariadb', ['--no-defaults', `--socket=${paths.socket}`, '-uroot', ...args], { encoding: 'utf8', input })
}

function ping() {
  const result = spawnSync('mariadb-admin', ['--no-defaults', `--socket=${paths.socket}`, '-uroot', 'ping'], { encoding: 'utf8' })
  return result.status === 0
}

function readPid() {
  if (!existsSync(paths.pid)) return null
  const pid = Number(readFileSync(paths.pid, 'utf8').trim())
  return Number.isInteger(pid) && pid > 0 ? pid : null
}

async function ensureInstalled() {
  if (which('mariadbd') && which('mariadb-install-db')) return
  await ensureDebianPackages(['mariadb-server'], 'The database (MariaDB)')
}

function sqlString(value) {
  return `'${String(value).replace(/\\/g, '\\\\').replace(/'/g, '\\\'')}'`
}

/** Creates the application user and the given databases (idempotent). */
export function ensureDatabases(names) {
  const statements = [
    `CREATE USER IF NOT EXISTS ${sqlString(db.user)}@'127.0.0.1' IDENTIFIED BY ${sqlString(db.password)};`,
    `CREATE USER IF NOT EXISTS ${sqlString(db.user)}@'localhost' IDENTIFIED BY ${sqlString(db.password)};`,
    ...names.flatMap(name => [
      `CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`,
      `GRANT ALL PRIVILEGES ON \`${name}\`.* TO ${sqlString(db.user)}@'127.0.0.1';`,
      `GRANT ALL PRIVILEGES ON \`${name}\`.* TO ${sqlString(db.user)}@'localhost';`,
    ]),
    'FLUSH PRIVILEGES;',
  ]
  const result = client([], statements.join('\n'))
  if (result.status !== 0) throw new Error(`Could not create the database user and databases: ${result.stderr}`)
}

/** Drops and recreates one database (used for the test database). */
export function recreateDatabase(name) {
  const result = client([], `DROP DATABASE IF EXISTS \`${name}\`;`)
  if (result.status !== 0) throw new Error(`Could not drop ${name}: ${result.stderr}`)
  ensureDatabases([name])
}

export const mariadb = {
  name: 'mariadb',
  async status() {
    const pid = readPid()
    const running = pid !== null && processAlive(pid) && ping()
    return { running, pid: running ? pid : null, detail: running ? `127.0.0.1:${db.port}, data in ${paths.data}` : 'stopped' }
  },
  /** Starts the server if it is not running; resolves to true when this call started it. */
  async start() {
    if ((await this.status()).running) return false
    await ensureInstalled()
    mkdirSync(base, { recursive: true })
    if (!existsSync(join(paths.data, 'mysql'))) {
      log(`initialising MariaDB data directory ${paths.data}`)
      const args = ['--no-defaults', `--datadir=${paths.data}`, '--auth-root-authentication-method=normal', '--skip-test-db']
      if (isRoot()) args.push('--user=root')
      const init = spawnSync('mariadb-install-db', args, { encoding: 'utf8' })
      if (init.status !== 0) throw new Error(`mariadb-install-db failed:\n${init.stdout}\n${init.stderr}`)
    }
    const args = [
      '--no-defaults',
      `--datadir=${paths.data}`,
      `--socket=${paths.socket}`,
      `--pid-file=${paths.pid}`,
      `--port=${db.port}`,
      '--bind-address=127.0.0.1',
      '--skip-name-resolve',
      `--log-error=${paths.log}`,
      '--default-time-zone=+00:00',
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
      '--max-connections=200',
    ]
    if (isRoot()) args.push('--user=root')
    const out = openSync(paths.log, 'a')
    const child = spawn('mariadbd', args, { detached: true, stdio: ['ignore', out, out] })
    child.unref()
    for (let i = 0; i < 300; i++) {
      if (ping()) {
        log(`MariaDB is up on 127.0.0.1:${db.port} (pid ${readPid() ?? child.pid})`)
        ensureDatabases([db.name, db.testName])
        return true
      }
      if (child.exitCode !== null) break
      await sleep(100)
    }
    throw new Error(`MariaDB did not start; see ${paths.log}`)
  },
  async stop() {
    const pid = readPid()
    if (pid === null || !processAlive(pid)) return false
    spawnSync('mariadb-admin', ['--no-defaults', `--socket=${paths.socket}`, '-uroot', 'shutdown'], { encoding: 'utf8' })
    for (let i = 0; i < 300 && processAlive(pid); i++) await sleep(100)
    if (processAlive(pid)) process.kill(pid, 'SIGTERM')
    log('MariaDB stopped')
    return true
  },
}
