// The object-store fake (s3rver) run by the project on 127.0.0.1, with its data under .data/objects.
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { dataDir, objectStore, root } from './config.mjs'
import { answersAt, detachedService } from './detached.mjs'

const base = join(dataDir, 'objects')
const data = join(base, 'data')

export const objectstore = detachedService({
  name: 'objects',
  label: 'object store',
  pidFile: join(base, 'objectstore.pid'),
  logFile: join(base, 'objectstore.log'),
  local: () => objectStore.local,
  prepare: () => mkdirSync(data, { recursive: true }),
  command: () => [join(root, 'scripts', 's3-fake.mjs'), String(objectStore.port), data, `${objectStore.bucket},${objectStore.testBucket}`],
  answers: () => answersAt(`http://127.0.0.1:${objectStore.port}/`),
  detail: () => `http://127.0.0.1:${objectStore.port}, bucket ${objectStore.bucket}`,
})

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
