// Guards on every unsafe API request, before any handler runs:
// - cross-site requests (by Sec-Fetch-Site or Origin) are refused with 403;
// - bodies must be JSON (415) and small (413).
// Exempt paths (the payment webhook, uploads) are checked their own way.
const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
const EXEMPT_ORIGIN = [/^\/api\/webhooks\//]
const EXEMPT_BODY = [/^\/api\/webhooks\//, /\/uploads(\/|$)/]
export const MAX_JSON_BYTES = 256 * 1024

/**
 * The origins that are ours: the one this request was sent to (scheme, host and port as the
 * server saw them; forwarded headers are not trusted) and the configured app URL (appUrl), which
 * is the reference behind a proxy that ends TLS.
 */
function ownOrigins(event: Parameters<typeof getRequestHost>[0]): string[] {
  const own = `${getRequestProtocol(event, { xForwardedProto: false })}://${getRequestHost(event, { xForwardedHost: false })}`
  const out = [normalOrigin(own)]
  const appUrl = useRuntimeConfig(event).appUrl
  if (appUrl) out.push(normalOrigin(appUrl))
  return out.filter((o): o is string => o !== null)
}

/** scheme://host:port as the URL standard writes it (default ports dropped), or null. */
function normalOrigin(value: string): string | null {
  try {
    const url = new URL(value)
    return url.origin === 'null' ? null : url.origin
  }
  catch {
    return null
  }
}

/** The whole origin must match one of ours: a different scheme or port is another site. "null" never does. */
function sameOrigin(origin: string, ours: string[]): boolean {
  const o = normalOrigin(origin)
  return o !== null && ours.includes(o)
}

export default defineEventHandler((event) => {
  if (!UNSAFE.has(event.method)) return
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/api/')) return

  if (!EXEMPT_ORIGIN.some(re => re.test(path))) {
    const site = getRequestHeader(event, 'sec-fetch-site')
    if (site === 'cross-site') throw createError({ statusCode: 403, statusMessage: 'Cross-site request refused' })
    const origin = getRequestHeader(event, 'origin')
    if (origin !== undefined && !sameOrigin(origin, ownOrigins(event))) {
      throw createError({ statusCode: 403, statusMessage: 'Cross-site request refused' })
    }
  }

  if (EXEMPT_BODY.some(re => re.test(path))) return
  const length = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (length > MAX_JSON_BYTES) throw createError({ statusCode: 413, statusMessage: 'That request is too large' })
  // a body without a length could be of any size: ask for the length (browsers always send it)
  if (getRequestHeader(event, 'transfer-encoding') !== undefined) throw createError({ statusCode: 411, statusMessage: 'Send a Content-Length' })
  if (length > 0) {
    const type = (getRequestHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
    if (type !== 'application/json') throw createError({ statusCode: 415, statusMessage: 'Send JSON (Content-Type: application/json)' })
  }
})
