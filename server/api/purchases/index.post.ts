import { purchases } from '../../db/schema'
import { purchaseSchema } from '#shared/schemas/purchase'

/** Record a purchase, split across the jobs it was for. */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { jobs: split, ...input } = await readBodyWith(event, purchaseSchema)
  return withFirm(auth, async (f) => {
    await checkJobs(f, split)
    const [row] = await f.tx.insert(purchases).values(f.values({ ...input, createdBy: f.userId })).returning()
    await saveSplit(f, row!.id, split)
    await f.audit('purchase.recorded', 'purchase', row!.id, { netPence: input.netPence })
    setResponseStatus(event, 201)
    return purchaseDetail(f, row!.id)
  })
})
