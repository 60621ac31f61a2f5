// Reading validated input: a failure answers 422 with one message per field.
import type { H3Event } from 'h3'
import type { z } from 'zod'

function invalid(error: z.ZodError, what: string): never {
  throw createError({
    statusCode: 422,
    statusMessage: `The ${what} is not valid.`,
    data: { fields: fieldErrors(error) },
  })
}

export async function readBodyWith<T extends z.ZodType>(event: H3Event, schema: T): Promise<z.output<T>> {
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    throw createError({ statusCode: 400, statusMessage: 'The request body is not valid JSON.' })
  }
  const result = schema.safeParse(body ?? {})
  if (!result.success) invalid(result.error, 'request body')
  return result.data
}

export function readQueryWith<T extends z.ZodType>(event: H3Event, schema: T): z.output<T> {
  const result = schema.safeParse(getQuery(event))
  if (!result.success) invalid(result.error, 'query')
  return result.data
}

export function readParamsWith<T extends z.ZodType>(event: H3Event, schema: T): z.output<T> {
  const result = schema.safeParse(getRouterParams(event, { decode: true }))
  if (!result.success) throw createError({ statusCode: 404, statusMessage: 'Nothing by that name.' })
  return result.data
}
