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
  const message = e.data?.statusMessage ?? e.data?.message ?? e.statusMessage
    ?? (status === 0 ? 'The server could not be reached. Check your connection and try again.' : 'The request failed.')
  return { message, fields: e.data?.data?.fields ?? {}, status }
}
