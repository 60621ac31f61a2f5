// Failures of a backing service become a clear 503 that says nothing was stored.
const connectionCodes = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'PROTOCOL_CONNECTION_LOST', 'EPIPE', 'ENOTFOUND', 'ER_CON_COUNT_ERROR'])

export function isConnectionFailure(error: unknown): boolean {
  let current: unknown = error
  for (let depth = 0; current && depth < 5; depth++) {
    const code = (current as { code?: string }).code
    if (code && connectionCodes.has(code)) return true
    current = (current as { cause?: unknown }).cause
  }
  return false
}

export function rethrowUnavailable(error: unknown, what: string): never {
  if (isConnectionFailure(error)) {
    throw createError({ statusCode: 503, statusMessage: `${what} is not answering; nothing was changed. Try again in a moment.` })
  }
  throw error
}
