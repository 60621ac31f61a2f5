// Receiving a multipart upload: the file is streamed to a scratch file on disk while its SHA-256
// and size are computed, so it is never held whole in memory; the other fields are small JSON.
import { createHash, randomBytes } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import { mkdir, rm } from 'node:fs/promises'
import { join, resolve } from 'node:path'
import { pipeline } from 'node:stream/promises'
import { Transform } from 'node:stream'
import busboy from 'busboy'
import type { H3Event } from 'h3'

export interface ReceivedUpload {
  path: string
  fileName: string
  sha256: string
  sizeBytes: number
  fields: Record<string, string>
  /** Removes the scratch file. */
  discard(): Promise<void>
}

export function scratchDirectory(): string {
  return resolve(useRuntimeConfig().dataPath, 'uploads')
}

function megabytes(bytes: number): string {
  return `${Math.round(bytes / (1024 * 1024))} MB`
}

export async function receiveUpload(event: H3Event): Promise<ReceivedUpload> {
  const limit = Number(useRuntimeConfig().uploadLimitBytes)
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (!type.startsWith('multipart/form-data')) {
    throw createError({ statusCode: 415, statusMessage: 'Send the upload as multipart/form-data with a "file" part and a "setting" part.' })
  }
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > limit + 1024 * 1024) {
    throw createError({ statusCode: 413, statusMessage: `The upload is larger than the limit of ${megabytes(limit)}.` })
  }
  const dir = scratchDirectory()
  await mkdir(dir, { recursive: true })
  const path = join(dir, `${Date.now()}-${randomBytes(8).toString('hex')}.part`)
  const discard = () => rm(path, { force: true })
  const fields: Record<string, string> = {}
  let fileName = ''
  let sha256 = ''
  let sizeBytes = 0
  let truncated = false
  let sawFile = false

  try {
    await new Promise<void>((done, fail) => {
      const parser = busboy({ headers: event.node.req.headers, limits: { files: 1, fileSize: limit, fields: 8, fieldSize: 256 * 1024 } })
      const writes: Promise<void>[] = []
      parser.on('field', (name, value) => {
        fields[name] = value
      })
      parser.on('file', (name, stream, info) => {
        if (name !== 'file' || sawFile) {
          stream.resume()
          return
        }
        sawFile = true
        fileName = info.filename || 'upload'
        const hash = createHash('sha256')
        const meter = new Transform({
          transform(chunk: Buffer, _encoding, next) {
            hash.update(chunk)
            sizeBytes += chunk.length
            next(null, chunk)
          },
        })
        stream.on('limit', () => {
          truncated = true
        })
        writes.push(pipeline(stream, meter, createWriteStream(path)).then(() => {
          sha256 = hash.digest('hex')
        }))
      })
      parser.on('error', fail)
      parser.on('close', () => {
        Promise.all(writes).then(() => done(), fail)
      })
      event.node.req.on('aborted', () => fail(new Error('the upload was interrupted')))
      event.node.req.pipe(parser)
    })
  }
  catch (error) {
    await discard()
    const reason = error instanceof Error ? error.message : String(error)
    throw createError({ statusCode: 400, statusMessage: `The upload could not be read: ${reason}.` })
  }
  if (truncated) {
    await discard()
    throw createError({ statusCode: 413, statusMessage: `The file is larger than the limit of ${megabytes(limit)}.` })
  }
  if (!sawFile) {
    await discard()
    throw createError({ statusCode: 422, statusMessage: 'The upload has no file.', data: { fields: { file: 'Choose a file to upload.' } } })
  }
  return { path, fileName, sha256, sizeBytes, fields, discard }
}
