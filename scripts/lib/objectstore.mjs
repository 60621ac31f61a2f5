// The object-store fake (s3rver) run by the project on 127.0.0.1, with its data under .data/objects.
import { spawn } from 'node:child_process'
import { existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { dataDir, objectStore, root } from './config.mjs'
import { log, processAlive, sleep } from './run.mjs'

const base = join(dataDir, 'objects')
const paths = { data: join(base, 'data'), pid: join(base, 'objectstore.pid'), log: join(base, 'objectstore.log') }

function readPid() {
  if (!existsSync(paths.pid)) return null
  const pid = Number(readFileSync(paths.pid, 'utf8').trim())
  return Number.isInteger(pid) && pid > 0 ? pid : null
}

async function answers() {
  try {
    const response = await fetch(`http://127.0.0.1:${objectStore.port}/`, { signal: AbortSignal.timeout(1000) })
    return response.status < 500
  }
  catch {
    return false
  }
}

export const objectstore = {
  name: 'objects',
  async status() {
    const pid = readPid()
    const running = pid !== null && processAlive(pid) && await answers()
    return { running, pid: running ? pid : null, detail: running ? `http://127.0.0.1:${objectStore.port}, bucket ${objectStore.bucket}` : 'stopped' }
  },
  async start() {
    if (!objectStore.local) return false
    if ((await this.status()).running) return false
    mkdirSync(paths.data, { recursive: true })
    const out = openSync(paths.log, 'a')
    const child = spawn(process.execPath, [join(root, 'scripts', 's3-fake.mjs'), String(objectStore.port), paths.data, `${objectStore.bucket},${objectStore.testBucket}`], {
      detached: true,
      stdio: ['ignore', out, out],
    })
    child.unref()
    writeFileSync(paths.pid, String(child.pid))
    for (let i = 0; i < 200; i++) {
      if (await answers()) {
        log(`object store is up on 127.0.0.1:${objectStore.port} (pid ${child.pid})`)
        return true
      }
      if (child.exitCode !== null) break
      await sleep(100)
    }
    throw new Error(`the object store did not start; see ${paths.log}`)
  },
  async stop() {
    const pid = readPid()
    if (pid === null || !processAlive(pid)) return false
    process.kill(pid, 'SIGTERM')
    for (let i = 0; i < 100 && processAlive(pid); i++) await sleep(50)
    if (processAlive(pid)) process.kill(pid, 'SIGKILL')
    rmSync(paths.pid, { force: true })
    log('object store stopped')
    return true
  },
}

/** Deletes every object of a bucket of the local fake (the test bucket before a test run). */
export async function emptyBucket(bucket) {
  const { S3Client, ListObjectsV2Command, DeleteObjectsCommand } = await import('@aws-sdk/client-s3')
  const client = new S3Client({
    endpoint: objectStore.endpoint, region: 'us-east-1', forcePathStyle: true,
    credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
  })
  for (;;) {
    const page = await client.send(new ListObjectsV2Command({ Bucket: bucket, MaxKeys: 1000 }))
    const keys = (page.Contents ?? []).map(o => ({ Key: o.Key }))
    if (keys.length === 0) break
    await client.send(new DeleteObjectsCommand({ Bucket: bucket, Delete: { Objects: keys } }))
  }
  client.destroy()
}
