// zod on every input, through h3's validated readers. A failure is a 400 that names each field,
// so the form can show the message beside it: { statusCode: 400, data: { fields: { email: '...' } } }.
import type { H3Event } from 'h3'
import type { z } from 'zod'
import { fieldErrors } from '#shared/schemas/common'

export function fieldError(fields: Record<string, string>, statusCode = 400, statusMessage = 'Check the highlighted fields') {
  return createError({ statusCode, statusMessage, data: { fields } })
}

// h3 wraps an error thrown inside a validator; so the validator returns zod's result and we throw here.
function unwrap<T>(result: z.ZodSafeParseResult<T>, where: 'body' | 'query' | 'params'): T {
  if (result.success) return result.data
  if (where === 'params') notFound()
  throw fieldError(fieldErrors(result.error.issues))
}

export async function readBodyWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return unwrap(await readValidatedBody(event, body => schema.safeParse(body ?? {})), 'body')
}

export async function readQueryWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return unwrap(await getValidatedQuery(event, q => schema.safeParse(q)), 'query')
}

/** Route parameters that fail validation answer 404: a malformed id names no row. */
export async function readParamsWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return unwrap(await getValidatedRouterParams(event, p => schema.safeParse(p)), 'params')
}

export function notFound(): never {
  throw createError({ statusCode: 404, statusMessage: 'Not found' })
}
