// Turns a failed $fetch into a message and per-field messages for forms.
export interface ApiProblem {
  message: string
  fields: Record<string, string>
  status: number
}

interface ErrorShape {
  statusCode?: number
  status?: number
  statusMessage?: string
  data?: { statusMessage?: string, message?: string, data?: { fields?: Record<string, string> } }
}

export function apiProblem(error: unknown): ApiProblem {
  const e = (error ?? {}) as ErrorShape
  const status = e.statusCode ?? e.status ?? 0
  // `message` keeps the full text; `statusMessage` has had non-ASCII characters removed (HTTP status lines are ASCII).
  const message = e.data?.message ?? e.data?.statusMessage ?? e.statusMessage
    ?? (status === 0 ? 'The server could not be reached. Check your connection and try again.' : 'The request failed.')
  return { message, fields: e.data?.data?.fields ?? {}, status }
}
