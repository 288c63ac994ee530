import { z } from 'zod'

const params = z.object({ token: z.string().regex(/^[\w-]{40,60}\.ics$/, { error: 'Not found.' }) })

/** Public: a person's calendar feed at its secret URL (/calendar/<token>.ics). 404 for an old or wrong one. */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, params)
  const body = await calendarFor(token.replace(/\.ics$/, ''))
  if (body === null) throw createError({ statusCode: 404, statusMessage: 'Not found', data: { message: 'This calendar link is not right or has been reset. Get the new one from Setwell, under Your account.' } })
  setResponseHeaders(event, { 'content-type': 'text/calendar; charset=utf-8', 'cache-control': 'private, no-store', 'x-content-type-options': 'nosniff' })
  return body
})
