import { eq } from 'drizzle-orm'
import { priceBooks } from '../db/schema'

/** The firm's price book, created with zero rates the first time it is asked for. */
export async function usePriceBook(f: FirmScope) {
  const [row] = await f.tx.select().from(priceBooks).where(eq(priceBooks.firmId, f.firmId))
  if (row) return row
  const [created] = await f.tx.insert(priceBooks).values({ firmId: f.firmId }).onConflictDoNothing().returning()
  if (created) return created
  const [again] = await f.tx.select().from(priceBooks).where(eq(priceBooks.firmId, f.firmId))
  return again!
}
