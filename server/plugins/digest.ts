// Daily digests of remark notices: on a server that runs jobs, checks once an hour and sends the
// digests once a day, in the hour given by runtimeConfig.digestHour (UTC, 7 when not set). Links in
// digests need the site's address (runtimeConfig.siteUrl); without it the round is skipped with a
// log line. Sending claims the notices first, so several servers never send the same digest twice.
import { sendDigests } from '../services/notices'

const HOUR = 60 * 60 * 1000

function digestHour(config: Record<string, unknown>): number {
  const hour = Number(config.digestHour ?? process.env.NUXT_DIGEST_HOUR ?? 7)
  return Number.isInteger(hour) && hour >= 0 && hour < 24 ? hour : 7
}

export default defineNitroPlugin((nitroApp) => {
  const config = useRuntimeConfig()
  if (!config.runJobs || import.meta.prerender) return
  let lastDay = ''
  const check = async () => {
    const now = new Date()
    const day = now.toISOString().slice(0, 10)
    if (now.getUTCHours() !== digestHour(config as unknown as Record<string, unknown>) || lastDay === day) return
    lastDay = day
    const base = String(config.siteUrl ?? '').replace(/\/+$/, '')
    if (!base) {
      console.warn('[digest] NUXT_SITE_URL is not set, so digests cannot link back to the site; skipped today\'s round.')
      return
    }
    try {
      const counts = await sendDigests(base)
      console.info(`[digest] sent ${counts.digests} digests with ${counts.notices} notices (${counts.failed} refused by the mail server, ${counts.dropped} dropped).`)
    }
    catch (error) {
      console.error('[digest]', error instanceof Error ? error.message : error)
    }
  }
  const timer = setInterval(() => void check(), HOUR)
  nitroApp.hooks.hook('close', () => clearInterval(timer))
})
