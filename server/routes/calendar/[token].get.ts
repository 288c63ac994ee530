import { calendarTokenParam } from '#shared/schemas/links'

/** Public: a person's calendar feed at its secret URL (/calendar/<token>.ics). 404 for an old or wrong one (server/utils/calendar.ts). */
export default defineEventHandler(async (event) => {
  const { token } = await readParamsWith(event, calendarTokenParam)
  const body = await calendarFor(token.replace(/\.ics$/, ''))
  setResponseHeaders(event, { 'content-type': 'text/calendar; charset=utf-8', 'cache-control': 'private, no-store', 'x-content-type-options': 'nosniff' })
  return body
})
