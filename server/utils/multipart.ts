// Reading an upload: a streamed multipart reader with hard limits (busboy); what is in the file is
// for images.ts (photos) and documents.ts (receipts) to say.
//
// Limits and answers (DEVELOPERS.md has the table):
// - the file may be at most uploadMaxBytes (15 MiB unless NUXT_UPLOAD_MAX_BYTES says otherwise);
//   the whole request that plus 64 KiB for the form's other parts. A Content-Length over that is
//   refused before a byte is read; a body without one (chunked) is counted as it arrives and
//   refused the moment it passes. Either way 413, and never more than the limit held in memory.
// - not multipart/form-data: 415.
import type { H3Event } from 'h3'
import busboy from 'busboy'

export const DEFAULT_UPLOAD_MAX_BYTES = 15 * 1024 * 1024
/** Room for the multipart boundaries, part headers and the small text fields beside the file. */
export const MULTIPART_OVERHEAD_BYTES = 64 * 1024
/** After a refusal, how long the client may go on sending (discarded) before the connection is cut. */
const DISCARD_GRACE_MS = 10_000

/** The largest file accepted, in bytes: runtime config `uploadMaxBytes`, else NUXT_UPLOAD_MAX_BYTES, else 15 MiB. */
export function uploadMaxBytes(): number {
  const fromConfig = (useRuntimeConfig() as { uploadMaxBytes?: unknown }).uploadMaxBytes
  for (const value of [fromConfig, process.env.NUXT_UPLOAD_MAX_BYTES]) {
    const n = Number(value)
    if (Number.isSafeInteger(n) && n > 0) return n
  }
  return DEFAULT_UPLOAD_MAX_BYTES
}

function megabytes(bytes: number) {
  return `${Math.floor(bytes / (1024 * 1024))} MB`
}

export function uploadTooLarge(maxFileBytes: number) {
  return fieldError({ file: `That file is too large: the limit is ${megabytes(maxFileBytes)}. Take the photo again at a lower size, or send a smaller copy.` }, 413, 'Upload too large')
}

/**
 * Once the answer is sent, a client that is still sending may go on for a while (its bytes are
 * read and dropped, so it sees our answer rather than a reset), but not for ever: past
 * `capBytes` or DISCARD_GRACE_MS the connection is closed. Call at the start of an upload route.
 */
export function limitUnreadBody(event: H3Event, capBytes: number) {
  const { req, res } = event.node
  res.once('finish', () => {
    if (req.complete || req.destroyed) return
    let dropped = 0
    const stop = () => {
      if (!req.complete) req.socket?.destroy()
    }
    const timer = setTimeout(stop, DISCARD_GRACE_MS)
    timer.unref()
    req.on('data', (chunk: Buffer) => {
      dropped += chunk.length
      if (dropped > capBytes) stop()
    })
    req.once('end', () => clearTimeout(timer))
    req.once('close', () => clearTimeout(timer))
    req.resume()
  })
}

/** Before reading: 415 unless multipart/form-data, 413 when the declared length is over the limit. */
export function assertMultipartRequest(event: H3Event, maxRequestBytes: number, maxFileBytes: number) {
  const type = (getRequestHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
  if (type !== 'multipart/form-data') {
    throw createError({ statusCode: 415, statusMessage: 'Send the file as multipart/form-data, in the field "file"' })
  }
  const declared = getRequestHeader(event, 'content-length')
  if (declared !== undefined && Number(declared) > maxRequestBytes) throw uploadTooLarge(maxFileBytes)
}

export interface UploadedFile {
  data: Buffer
  /** As the client named it: for display only, never trusted, never put in a header. */
  filename: string
  /** As the client declared it: never trusted (the content is sniffed). */
  declaredType: string
}

export interface MultipartUpload {
  fields: Record<string, string>
  file: UploadedFile | null
}

export interface MultipartOptions {
  /** The one file part accepted. */
  fileField: string
  /** The text fields accepted; others are ignored. */
  fields: readonly string[]
  maxFileBytes: number
  maxRequestBytes: number
  maxFieldBytes?: number
}

/**
 * Stream a multipart body through busboy: one file (held in memory up to maxFileBytes, no more)
 * and a few short text fields. Rejects with 413 past a limit, 400 for a malformed body or
 * unexpected parts.
 */
export function readMultipartUpload(event: H3Event, opts: MultipartOptions): Promise<MultipartUpload> {
  const req = event.node.req
  let parser: busboy.Busboy
  try {
    parser = busboy({
      headers: req.headers,
      defParamCharset: 'utf8',
      limits: {
        fileSize: opts.maxFileBytes,
        files: 1,
        fields: opts.fields.length + 2,
        parts: opts.fields.length + 3,
        fieldNameSize: 100,
        fieldSize: opts.maxFieldBytes ?? 4096,
        headerPairs: 20,
      },
    })
  }
  catch {
    // no boundary, or a content type busboy does not read
    throw createError({ statusCode: 415, statusMessage: 'Send the file as multipart/form-data, in the field "file"' })
  }

  return new Promise<MultipartUpload>((resolve, reject) => {
    let settled = false
    let received = 0
    const fields: Record<string, string> = {}
    let file: UploadedFile | null = null
    let chunks: Buffer[] = []
    let fileBytes = 0

    const finish = (err: unknown, value?: MultipartUpload) => {
      if (settled) return
      settled = true
      req.off('data', count)
      if (err) {
        req.unpipe(parser)
        parser.removeAllListeners()
        parser.on('error', () => {}) // the parser may still complain about the cut-off body
        chunks = []
        reject(err)
      }
      else resolve(value!)
    }
    const count = (chunk: Buffer) => {
      received += chunk.length
      if (received > opts.maxRequestBytes) finish(uploadTooLarge(opts.maxFileBytes))
    }
    const badRequest = (message: string, field = opts.fileField) => fieldError({ [field]: message })

    req.on('data', count)
    req.once('error', () => finish(createError({ statusCode: 400, statusMessage: 'The upload was interrupted' })))
    req.once('close', () => {
      if (!req.complete) finish(createError({ statusCode: 400, statusMessage: 'The upload was interrupted' }))
    })

    parser.on('file', (name, stream, info) => {
      if (settled || name !== opts.fileField || file) {
        stream.resume()
        finish(badRequest(`Send one photo, in the field "${opts.fileField}".`))
        return
      }
      file = { data: Buffer.alloc(0), filename: info.filename ?? '', declaredType: info.mimeType ?? '' }
      stream.on('data', (chunk: Buffer) => {
        if (settled) return
        fileBytes += chunk.length
        chunks.push(chunk)
      })
      stream.once('limit', () => finish(uploadTooLarge(opts.maxFileBytes)))
    })
    parser.on('field', (name, value, info) => {
      if (settled || !opts.fields.includes(name)) return
      if (info.valueTruncated) {
        finish(badRequest('That is too long.', name))
        return
      }
      fields[name] = value
    })
    for (const limit of ['partsLimit', 'filesLimit', 'fieldsLimit'] as const) {
      parser.once(limit, () => finish(badRequest('Send one photo at a time, with only its caption and what it belongs to.')))
    }
    parser.once('error', () => finish(badRequest('That upload could not be read. Send it again.')))
    parser.once('close', () => {
      if (file) file.data = Buffer.concat(chunks, fileBytes)
      chunks = []
      finish(null, { fields, file })
    })
    req.pipe(parser)
  })
}

/** A client's file name, kept for display: no path, no control characters, at most 200 characters. */
export function cleanFilename(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? ''
  // eslint-disable-next-line no-control-regex
  return base.replace(/[\u0000-\u001f\u007f-\u009f]/g, '').trim().slice(0, 200)
}
