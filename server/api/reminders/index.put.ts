import { reminderRules } from '../../db/schema'
import { reminderRulesSchema } from '#shared/schemas/firm'

/** Change the reminder schedule and its words (the whole list at once; an empty list stops reminders). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { rules } = await readBodyWith(event, reminderRulesSchema)
  return withFirm(auth, async (f) => {
    await reminderRulesFor(f)
    await f.tx.delete(reminderRules).where(f.where(reminderRules))
    if (rules.length) await f.tx.insert(reminderRules).values(rules.map(r => f.values(r)))
    await f.audit('reminders.changed', 'firm', f.firmId, { count: rules.length })
    return f.tx.select().from(reminderRules).where(f.where(reminderRules))
  })
})
