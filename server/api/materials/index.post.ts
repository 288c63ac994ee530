import { randomBytes } from 'node:crypto'
import { materials } from '../../db/schema'
import { materialSchema } from '#shared/schemas/material'

/** Add a material to the catalogue (owner and office: they buy the materials). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const input = await readBodyWith(event, materialSchema)
  return withFirm(auth, async (f) => {
    await catalogueRows(f)
    const key = `${input.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40) || 'material'}-${randomBytes(3).toString('hex')}`
    const [row] = await f.tx.insert(materials).values(f.values({ ...input, key, source: 'Entered by the firm.' })).returning()
    await f.audit('material.created', 'material', row!.id, { name: row!.name })
    setResponseStatus(event, 201)
    return row!
  })
})
