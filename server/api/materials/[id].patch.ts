import { eq, sql } from 'drizzle-orm'
import { materials } from '../../db/schema'
import { materialSchema } from '#shared/schemas/material'
import { idParam } from '#shared/schemas/common'

/**
 * Change a material: price, pack, coverage, supplier, or switch it off (materials are never
 * deleted, because quotes already drafted name them). A changed coverage is marked as the firm's own.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { id } = await readParamsWith(event, idParam)
  const input = await readBodyWith(event, materialSchema)
  return withFirm(auth, async (f) => {
    const before = await findOr404(f, materials, id, { lock: true })
    const coverageChanged = before.coverageCm2PerPack !== input.coverageCm2PerPack || before.atThicknessMm !== input.atThicknessMm || before.coverageMmPerPack !== input.coverageMmPerPack
    const [row] = await f.tx.update(materials).set({ ...input, ...(coverageChanged ? { source: 'Coverage entered by the firm.' } : {}), updatedAt: sql`now()` })
      .where(f.where(materials, eq(materials.id, id))).returning()
    await f.audit('material.updated', 'material', id, { fields: Object.keys(input) })
    return row!
  })
})
