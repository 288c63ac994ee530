// Documents: a purchase's receipt, or a contractor's CIS statement, as a photo or a PDF. They come
// in through the same streamed, size-limited multipart reader as site photos
// (server/utils/multipart.ts) and are sniffed by their bytes, never their name. Photos are re-encoded
// without metadata like site photos; a PDF is kept as sent (the accountant needs the original) and
// only ever served as a download, sandboxed, never shown inline.
import { asc, eq } from 'drizzle-orm'
import { fileTypeFromBuffer } from 'file-type'
import { cisStatements, documents, purchases } from '../db/schema'
import type { FirmScope } from './db'
import type { DocumentTarget } from '#shared/schemas/photo'
import { PHOTO_TYPES, type PhotoType } from './images'
import type { UploadedFile } from './multipart'

export function notADocument(detail = 'That file is not a receipt Setwell can keep. Send a PDF, or a JPEG, PNG, WebP or HEIC photo.') {
  return fieldError({ file: detail }, 415, 'Unsupported file type')
}

/** What the bytes are: a PDF, or one of the photo types; 415 for anything else (markup above all). */
export async function sniffDocument(file: UploadedFile): Promise<'application/pdf' | PhotoType> {
  const head = file.data.subarray(0, 4100)
  const text = head.subarray(0, 512).toString('latin1').trimStart().toLowerCase()
  if (text.startsWith('<') || /svg|html|xml/i.test(file.declaredType) || /\.(svgz?|html?|xhtml|xml)$/i.test(file.filename)) {
    throw notADocument('SVG and web pages cannot be kept as receipts. Send a PDF or a photo.')
  }
  const sniffed = await fileTypeFromBuffer(head)
  if (sniffed?.mime === 'application/pdf' && head.subarray(0, 5).toString('latin1') === '%PDF-') return 'application/pdf'
  if (sniffed && (PHOTO_TYPES as readonly string[]).includes(sniffed.mime)) return sniffed.mime as PhotoType
  throw notADocument()
}

function targetMissing(key: 'purchaseId' | 'cisStatementId'): never {
  const what = key === 'purchaseId' ? 'purchase' : 'CIS statement'
  throw createError({ statusCode: 404, statusMessage: 'Not found', data: { fields: { [key]: `There is no such ${what} in this firm.` } } })
}

/** The target must be this firm's (another firm's id is the same 404 as a missing one). */
export async function resolveDocumentTarget(f: FirmScope, target: DocumentTarget) {
  if (target.purchaseId) {
    const [row] = await f.tx.select({ id: purchases.id }).from(purchases).where(f.where(purchases, eq(purchases.id, target.purchaseId)))
    if (!row) targetMissing('purchaseId')
    return { purchaseId: row.id, cisStatementId: null }
  }
  const [row] = await f.tx.select({ id: cisStatements.id }).from(cisStatements).where(f.where(cisStatements, eq(cisStatements.id, target.cisStatementId!)))
  if (!row) targetMissing('cisStatementId')
  return { purchaseId: null, cisStatementId: row.id }
}

export type DocumentRow = typeof documents.$inferSelect

export function documentJson(row: DocumentRow) {
  return {
    id: row.id,
    purchaseId: row.purchaseId,
    cisStatementId: row.cisStatementId,
    contentType: row.contentType,
    bytes: row.bytes,
    originalName: row.originalName,
    createdAt: row.createdAt,
    url: `/documents/${row.id}`,
  }
}
export type DocumentJson = ReturnType<typeof documentJson>

export async function documentsOf(f: FirmScope, target: { purchaseId?: string, cisStatementId?: string }) {
  const rows = await f.tx.select().from(documents).where(f.where(documents,
    target.purchaseId ? eq(documents.purchaseId, target.purchaseId) : eq(documents.cisStatementId, target.cisStatementId!),
  )).orderBy(asc(documents.createdAt))
  return rows.map(documentJson)
}
