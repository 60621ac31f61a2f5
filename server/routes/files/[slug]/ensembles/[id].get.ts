// GET /files/<slug>/ensembles/<id>?format=original|csv|json|npy[&configuration=k]
// The file as uploaded streams straight from object storage; other formats are written by the
// engine's writers in a worker thread.
import { z } from 'zod'
import { findEnsemble } from '../../../../services/ensembles'

const query = z.object({
  format: z.enum(['original', 'csv', 'json', 'npy'], { message: 'The format is original, csv, json or npy.' }).default('original'),
  configuration: z.coerce.number().int().min(0).optional(),
})

const types = { csv: 'text/csv; charset=utf-8', json: 'application/json', npy: 'application/octet-stream' } as const

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, ensembleParams)
  const { format, configuration } = readQueryWith(event, query)
  const { companion } = await requireCompanionRole(event, slug, 'reader', { tokenScope: 'ensembles:read' })
  const ensemble = await findEnsemble(companion.id, id)
  if (configuration !== undefined && configuration >= ensemble.configurationCount) {
    throw createError({ statusCode: 404, statusMessage: `This ensemble has configurations 0 to ${ensemble.configurationCount - 1}.` })
  }
  const base = ensemble.fileName.replace(/\.[^.]+$/, '').replace(/[^\w.-]+/g, '_') || `ensemble-${id}`
  if (format === 'original' && configuration === undefined) {
    setResponseHeaders(event, {
      'Content-Type': 'application/octet-stream',
      'Content-Disposition': `attachment; filename="${ensemble.fileName.replace(/"/g, '')}"`,
      'Content-Length': String(ensemble.sizeBytes),
      'X-Content-SHA256': ensemble.sha256,
    })
    return sendStream(event, await getObjectStream(ensemble.objectKey).catch(error => storageUnavailable(error)))
  }
  const target = format === 'original' ? 'json' : format
  const bytes = await getObjectBytes(ensemble.objectKey).catch(error => storageUnavailable(error))
  const converted = await useWorkerPool('convert-ensemble').run({ bytes, fileName: ensemble.fileName, format: target, configuration }) as { ok: true, bytes: Uint8Array } | { ok: false, message: string }
  if (!converted.ok) throw createError({ statusCode: 422, statusMessage: `This ensemble cannot be written as ${target.toUpperCase()}: ${converted.message}` })
  const suffix = configuration === undefined ? '' : `-configuration-${configuration}`
  setResponseHeaders(event, {
    'Content-Type': types[target],
    'Content-Disposition': `attachment; filename="${base}${suffix}.${target}"`,
  })
  return Buffer.from(converted.bytes.buffer, converted.bytes.byteOffset, converted.bytes.byteLength)
})
