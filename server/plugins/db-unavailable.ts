// When PostgreSQL cannot be reached (stopped, restarting, the connection cut), every request that
// needs it answers 503 with a clear message instead of a bare 500: nothing was saved, try again.
// The pool reconnects by itself once the database is back, so no restart is needed.
//
// Nitro calls its `error` hooks (synchronously, before the error handler renders the answer), so
// marking the error here changes both the API's JSON and the error page.
const CONNECTION_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', '57P01', '57P02', '57P03', '08000', '08001', '08003', '08004', '08006'])
const CONNECTION_MESSAGES = /Connection terminated|terminating connection|Client has encountered a connection error|connect ECONNREFUSED|the database system is (starting up|shutting down)|timeout exceeded when trying to connect/i

export function isDatabaseUnavailable(err: unknown): boolean {
  for (let e = err as { code?: string, message?: string, cause?: unknown } | undefined, depth = 0; e && depth < 6; e = e.cause as typeof e, depth++) {
    if (e.code && CONNECTION_CODES.has(e.code)) return true
    if (typeof e.message === 'string' && CONNECTION_MESSAGES.test(e.message)) return true
  }
  return false
}

export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error, context) => {
    const e = error as { statusCode?: number, statusMessage?: string, data?: unknown, unhandled?: boolean, fatal?: boolean }
    if ((e.statusCode ?? 500) < 500 || !isDatabaseUnavailable(error)) return
    e.statusCode = 503
    e.statusMessage = 'Database unavailable'
    e.data = { message: 'Setwell cannot reach its database just now. Nothing was saved: try again in a minute.' }
    e.unhandled = false
    e.fatal = false
    const event = (context as { event?: Parameters<typeof setResponseHeader>[0] }).event
    if (event && !event.node.res.headersSent) setResponseHeader(event, 'retry-after', 30)
  })
})
