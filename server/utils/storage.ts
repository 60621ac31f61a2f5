// Object storage through the S3 API (a local fake in development and tests, a real endpoint by
// configuration). Objects are keyed by the SHA-256 of their content, so a key never changes meaning.
import { DeleteObjectCommand, GetObjectCommand, HeadBucketCommand, HeadObjectCommand, S3Client } from '@aws-sdk/client-s3'
import { Upload } from '@aws-sdk/lib-storage'
import type { Readable } from 'node:stream'

let client: S3Client | undefined

function settings() {
  return useRuntimeConfig().s3
}

export function useObjectStore(): S3Client {
  if (!client) {
    const s3 = settings()
    client = new S3Client({
      endpoint: s3.endpoint,
      region: s3.region,
      forcePathStyle: Boolean(s3.forcePathStyle),
      credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey },
    })
  }
  return client
}

export function objectKeyFor(sha256: string): string {
  return `sha256/${sha256.slice(0, 2)}/${sha256.slice(2, 4)}/${sha256}`
}

/** Turns a storage failure into a clear 503 for the person, nothing half-done behind it. */
export function storageUnavailable(error: unknown): never {
  const reason = error instanceof Error ? error.message : String(error)
  throw createError({ statusCode: 503, statusMessage: 'Object storage is not answering; nothing was changed. Try again in a moment.', data: { reason } })
}

export async function storageReachable(): Promise<boolean> {
  try {
    await useObjectStore().send(new HeadBucketCommand({ Bucket: settings().bucket }))
    return true
  }
  catch {
    return false
  }
}

export async function objectExists(key: string): Promise<boolean> {
  try {
    await useObjectStore().send(new HeadObjectCommand({ Bucket: settings().bucket, Key: key }))
    return true
  }
  catch (error) {
    const status = (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode
    if (status === 404) return false
    throw error
  }
}

/** Streams a body into storage (multipart for large files); resolves when it is stored. */
export async function putObject(key: string, body: Readable | Uint8Array, contentType = 'application/octet-stream'): Promise<void> {
  const upload = new Upload({
    client: useObjectStore(),
    params: { Bucket: settings().bucket, Key: key, Body: body, ContentType: contentType },
    partSize: 8 * 1024 * 1024,
    queueSize: 2,
  })
  await upload.done()
}

export async function getObjectStream(key: string): Promise<Readable> {
  const reply = await useObjectStore().send(new GetObjectCommand({ Bucket: settings().bucket, Key: key }))
  return reply.Body as Readable
}

export async function getObjectBytes(key: string): Promise<Uint8Array> {
  const reply = await useObjectStore().send(new GetObjectCommand({ Bucket: settings().bucket, Key: key }))
  if (!reply.Body) throw new Error(`object ${key} has no body`)
  return reply.Body.transformToByteArray()
}

export async function deleteObject(key: string): Promise<void> {
  await useObjectStore().send(new DeleteObjectCommand({ Bucket: settings().bucket, Key: key }))
}
