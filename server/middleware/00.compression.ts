// Pages and API answers go out compressed (brotli or gzip, as the browser says it takes them in
// Accept-Encoding), by Express's `compression` middleware: it negotiates the encoding with its
// q-values, adds Vary: Accept-Encoding, leaves alone what is under 1 KB, already encoded, a HEAD or
// marked no-transform, and keeps back-pressure (a full socket pauses the compressor). Brotli at
// quality 4, gzip at level 6: fast enough for every answer.
//
// Not here:
// - static files (/_nuxt/*, icons, /sw.js): Nitro answers them before any middleware, with the
//   .br or .gz it made at build (nitro.compressPublicAssets in nuxt.config.ts);
// - the exports (/exports/*.csv, quarter.zip): they write to the socket themselves and wait for
//   it to drain (server/utils/exports.ts); a ZIP is compressed already;
// - anything but HTML and JSON (photos, PDFs, documents, calendar feeds, any event stream);
// - requests that take no encoding, like the in-process calls a server-rendered page makes.
import type { NodeMiddleware } from 'h3'
import compression from 'compression'

const COMPRESSED = /^(?:text\/html|application\/json)\b/i
const NEVER = ['/exports/']

const compress = compression({
  filter: (_req, res) => COMPRESSED.test(String(res.getHeader('content-type') ?? '')),
}) as unknown as NodeMiddleware

const middleware = fromNodeMiddleware(compress)

export default defineEventHandler((event) => {
  if (!event.node.req.headers['accept-encoding']) return
  if (NEVER.some(p => event.path.startsWith(p))) return
  return middleware(event)
})
