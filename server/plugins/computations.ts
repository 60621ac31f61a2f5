// The computation runner: recovers rows left running by a stopped server, queues computations whose
// engine version changed, then claims queued computations one at a time, off the request thread.
import { recoverInterrupted, requeueAffected, runNextComputation } from '../services/computations'

export default defineNitroPlugin((nitroApp) => {
  if (!useRuntimeConfig().runJobs || import.meta.prerender) return
  let stopped = false
  let timer: ReturnType<typeof setTimeout> | undefined
  let rounds = 0
  const loop = async () => {
    if (stopped) return
    let ran = false
    try {
      if (++rounds % 10 === 0) await recoverInterrupted()
      ran = await runNextComputation()
    }
    catch (error) {
      console.error('[computations]', error instanceof Error ? error.message : error)
    }
    if (!stopped) timer = setTimeout(loop, ran ? 50 : 1000)
  }
  const start = async () => {
    try {
      await recoverInterrupted()
      await requeueAffected()
    }
    catch (error) {
      console.error('[computations] could not recover the queue:', error instanceof Error ? error.message : error)
    }
    timer = setTimeout(loop, 200)
  }
  void start()
  nitroApp.hooks.hook('close', async () => {
    stopped = true
    clearTimeout(timer)
    await closeWorkerPools()
  })
})
