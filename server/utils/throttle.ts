// Sign-in throttling: failed attempts are counted per account key and per client address
// in a fixed window; past the limit that key is locked for the rest of one window.
import type { H3Event } from 'h3'

export function clientAddress(event: H3Event): string {
  const trustProxy = Boolean(useRuntimeConfig().trustProxy)
  return getRequestIP(event, { xForwardedFor: trustProxy }) ?? 'unknown'
}

function throttleKeys(event: H3Event, email: string) {
  return { account: `account:${email}`, address: `address:${clientAddress(event)}` }
}

const lockedMessage = (minutes: number) =>
  `Too many failed sign-in attempts for this account or from this address. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.`

/** Throws 429 when the account or the address is locked. */
export async function assertSignInAllowed(event: H3Event, email: string): Promise<void> {
  const keys = throttleKeys(event, email)
  const rows = await useDB().select().from(tables.signInThrottle)
    .where(inArray(tables.signInThrottle.key, [keys.account, keys.address]))
  const now = Date.now()
  const lockedUntil = Math.max(0, ...rows.map(r => r.lockedUntil ? new Date(r.lockedUntil).getTime() : 0))
  if (lockedUntil > now) {
    const minutes = Math.max(1, Math.ceil((lockedUntil - now) / 60_000))
    setResponseHeader(event, 'Retry-After', Math.ceil((lockedUntil - now) / 1000))
    throw createError({ statusCode: 429, statusMessage: lockedMessage(minutes) })
  }
}

export async function recordSignInFailure(event: H3Event, email: string): Promise<void> {
  const { auth } = useRuntimeConfig()
  const keys = throttleKeys(event, email)
  const window = Number(auth.windowMinutes)
  const db = useDB()
  for (const [key, limit] of [[keys.account, Number(auth.failuresPerAccount)], [keys.address, Number(auth.failuresPerAddress)]] as const) {
    // Assignments in ON DUPLICATE KEY UPDATE run left to right and see the new values.
    await db.execute(sql`
      INSERT INTO sign_in_throttle (throttle_key, failures, window_start, locked_until)
      VALUES (${key}, 1, UTC_TIMESTAMP(), IF(1 >= ${limit}, UTC_TIMESTAMP() + INTERVAL ${window} MINUTE, NULL))
      ON DUPLICATE KEY UPDATE
        failures = IF(window_start < UTC_TIMESTAMP() - INTERVAL ${window} MINUTE, 1, failures + 1),
        locked_until = IF(failures >= ${limit}, UTC_TIMESTAMP() + INTERVAL ${window} MINUTE, locked_until),
        window_start = IF(failures = 1, UTC_TIMESTAMP(), window_start)`)
  }
}

export async function recordSignInSuccess(event: H3Event, email: string): Promise<void> {
  const keys = throttleKeys(event, email)
  await useDB().delete(tables.signInThrottle).where(eq(tables.signInThrottle.key, keys.account))
}
