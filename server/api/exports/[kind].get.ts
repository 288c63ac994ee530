import { z } from 'zod'
import { periodQuery } from '#shared/schemas/quarter'
import { EXPORT_KINDS } from '../../utils/exports'

const params = z.object({ kind: z.enum([...EXPORT_KINDS, 'pack'], { error: 'Not found.' }) })

/**
 * The accountant's downloads for a VAT quarter (`quarterOf`) or a date range (`from`, `to`): one CSV
 * (invoices, invoice-lines, payments, purchases, cis-deductions, vat-summary, vat-breakdown), or
 * `pack`, all of them in one ZIP. Streamed in batches. Owner, office and accountant (reading only).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'exports:download')
  const parsed = params.safeParse(getRouterParams(event))
  if (!parsed.success) notFound()
  const q = await readQueryWith(event, periodQuery)
  const period = await withFirm(auth, f => periodOf(f, q))
  if (parsed.data.kind === 'pack') await streamPack(event, auth, period)
  else await streamCsv(event, auth, parsed.data.kind, period)
})
