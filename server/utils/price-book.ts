import { getTableColumns, SQL } from 'drizzle-orm'
import { priceBooks } from '../db/schema'

type PriceBook = typeof priceBooks.$inferSelect

/** A price book as a new firm's would be (the columns' defaults: zero rates), not written anywhere. */
function emptyPriceBook(firmId: string): PriceBook {
  const row: Record<string, unknown> = { firmId }
  for (const [key, col] of Object.entries(getTableColumns(priceBooks))) {
    if (key === 'firmId') continue
    row[key] = col.default instanceof SQL ? new Date() : structuredClone(col.default ?? null)
  }
  return row as PriceBook
}

/**
 * The firm's price book. Every firm gets one when it is made (server/db/firm-defaults.ts); should
 * one be missing, this answers the defaults without writing (a read writes nothing).
 */
export async function usePriceBook(f: FirmScope): Promise<PriceBook> {
  const [row] = await f.tx.select().from(priceBooks).where(f.where(priceBooks))
  return row ?? emptyPriceBook(f.firmId)
}
