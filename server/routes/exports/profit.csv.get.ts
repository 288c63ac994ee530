import { UTF8_BOM } from '#shared/utils/csv'
import { profitQuerySchema } from '#shared/schemas/profit'

/**
 * The profit table as a CSV download for the accountant: the same rows as GET /api/profit (at /exports/profit.csv), amounts
 * in pounds with two decimals, dates ISO, UTF-8 with a byte-order mark (shared/utils/csv.ts).
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'exports:download')
  const q = await readQueryWith(event, profitQuerySchema)
  const table = await withFirm(auth, f => profitTable(f, q))
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    // from and to are checked ISO dates, so the name needs no escaping
    'content-disposition': `attachment; filename="setwell-profit-${q.from}-to-${q.to}.csv"`,
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  })
  return UTF8_BOM + profitCsv(table)
})
