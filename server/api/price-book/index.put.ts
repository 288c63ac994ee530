import { sql } from 'drizzle-orm'
import { priceBooks } from '../../db/schema'
import { priceBookSchema } from '#shared/schemas/quote'

/** Change the price book (owner only: it is a firm setting). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'firm:manage')
  const input = await readBodyWith(event, priceBookSchema)
  return withFirm(auth, async (f) => {
    const [row] = await f.tx.insert(priceBooks).values({ firmId: f.firmId, ...input })
      .onConflictDoUpdate({ target: priceBooks.firmId, set: { ...input, updatedAt: sql`now()` } }).returning()
    await f.audit('price-book.updated', 'price-book', f.firmId, { fields: Object.keys(input) })
    return row
  })
})
