// Server-sent events: the computation's status and progress, with an estimate of the time left,
// until it ends (current, failed or cancelled).
import { findComputation } from '../../../../../services/computations'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, computationParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  const stream = createEventStream(event)
  let open = true
  stream.onClosed(() => {
    open = false
  })
  ;(async () => {
    while (open) {
      const row = await findComputation(companion.id, id).catch(() => null)
      if (!row) break
      const elapsed = row.startedAt ? (Date.now() - new Date(row.startedAt).getTime()) / 1000 : 0
      const secondsLeft = row.status === 'running' && row.progress > 0.02 ? Math.round((elapsed * (1 - row.progress)) / row.progress) : null
      await stream.push(JSON.stringify({ status: row.status, progress: row.progress, note: row.progressNote, error: row.error, secondsLeft }))
      if (row.status !== 'queued' && row.status !== 'running') break
      await new Promise(resolve => setTimeout(resolve, 500))
    }
    await stream.close()
  })()
  return stream.send()
})
