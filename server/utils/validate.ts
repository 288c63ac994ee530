// zod on every input, through h3's validated readers. A failure is a 400 that names each field,
// so the form can show the message beside it: { statusCode: 400, data: { fields: { email: '...' } } }.
//
// A second wall before the schema: a string anywhere in a body or query (a key too) holding a NUL
// or half of a surrogate pair on its own is a 400 naming where it is, even inside a part the schema
// takes as it comes (the rows of a customer import). PostgreSQL's text and jsonb refuse both, so
// no such string may reach a query or the audit log. The schemas' text() says the same, and more.
import type { H3Event } from 'h3'
import type { z } from 'zod'
import { brokenTextAt, fieldErrors, UNUSUAL_CHARACTER } from '#shared/schemas/common'

export function fieldError(fields: Record<string, string>, statusCode = 400, statusMessage = 'Check the highlighted fields') {
  return createError({ statusCode, statusMessage, data: { fields } })
}

/** The schema's result, unless the input holds a broken character: then a failure naming where. */
function parseWith<S extends z.ZodType>(schema: S, input: unknown): Parsed<z.output<S>> {
  const at = brokenTextAt(input)
  if (at) return { success: false, error: { issues: [{ path: at, message: UNUSUAL_CHARACTER }] } }
  return schema.safeParse(input)
}

type Parsed<T> = { success: true, data: T } | { success: false, error: { issues: readonly { path: PropertyKey[], message: string }[] } }

// h3 wraps an error thrown inside a validator; so the validator returns zod's result and we throw here.
function unwrap<T>(result: Parsed<T>, where: 'body' | 'query' | 'params'): T {
  if (result.success) return result.data
  if (where === 'params') notFound()
  throw fieldError(fieldErrors(result.error.issues))
}

export async function readBodyWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return unwrap(await readValidatedBody(event, body => parseWith(schema, body ?? {})), 'body')
}

export async function readQueryWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return unwrap(await getValidatedQuery(event, q => parseWith(schema, q)), 'query')
}

/** Route parameters that fail validation answer 404: a malformed id names no row. */
export async function readParamsWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return unwrap(await getValidatedRouterParams(event, p => schema.safeParse(p)), 'params')
}

export function notFound(): never {
  throw createError({ statusCode: 404, statusMessage: 'Not found' })
}
