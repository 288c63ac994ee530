import { firms, memberships, users } from '../../db/schema'
import { addFirmDefaults } from '../../db/firm-defaults'
import { signUpSchema } from '#shared/schemas/auth'
import { randomUUID } from 'node:crypto'

/** Sign-up creates a firm and its owner, and signs the owner in. One transaction: all or nothing. */
export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, signUpSchema)
  const passwordHash = await hashPassword(input.password)
  const firmId = randomUUID()
  try {
    await useDb().transaction(async (tx) => {
      const [user] = await tx.insert(users).values({ email: input.email, name: input.name, passwordHash }).returning({ id: users.id })
      await scopeTransaction(tx, firmId, user!.id)
      const f = new FirmScope(tx, firmId, user!.id)
      await tx.insert(firms).values({ id: firmId, tradingName: input.firmName })
      await tx.insert(memberships).values(f.values({ userId: user!.id, role: 'owner' as const }))
      // the price book, materials, reminders and Bank Rate a firm starts with: made now, never on a read
      await addFirmDefaults(tx, firmId, user!.id)
      await f.audit('firm.created', 'firm', firmId, { tradingName: input.firmName })
      await startSession(event, tx, user!.id, firmId)
    })
  }
  catch (err) {
    if (isUniqueViolation(err)) {
      throw fieldError({ email: 'An account with this e-mail already exists. Sign in, or ask your firm\'s owner for an invitation.' }, 409, 'Account exists')
    }
    throw err
  }
  setResponseStatus(event, 201)
  return { ok: true, firmId }
})
