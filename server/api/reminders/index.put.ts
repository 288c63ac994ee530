import { z } from 'zod'
import { reminderRules } from '../../db/schema'
import { text } from '#shared/schemas/common'

const schema = z.object({
  rules: z.array(z.object({
    offsetDays: z.int({ error: 'Enter whole days.' }).min(-60, { error: 'At most 60 days before.' }).max(365, { error: 'At most a year after.' }),
    subject: text().trim().min(1, { error: 'Write the subject.' }).max(200),
    body: text().trim().min(1, { error: 'Write the message.' }).max(4000),
  })).max(10, { error: 'At most 10 reminders.' }),
}).superRefine((v, ctx) => {
  const seen = new Set<number>()
  v.rules.forEach((r, i) => {
    if (seen.has(r.offsetDays)) ctx.addIssue({ code: 'custom', path: ['rules', i, 'offsetDays'], message: 'Two reminders on the same day.' })
    seen.add(r.offsetDays)
  })
})

/** Change the reminder schedule and its words (the whole list at once; an empty list stops reminders). */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const { rules } = await readBodyWith(event, schema)
  return withFirm(auth, async (f) => {
    await reminderRulesFor(f)
    await f.tx.delete(reminderRules).where(f.where(reminderRules))
    if (rules.length) await f.tx.insert(reminderRules).values(rules.map(r => f.values(r)))
    await f.audit('reminders.changed', 'firm', f.firmId, { count: rules.length })
    return f.tx.select().from(reminderRules).where(f.where(reminderRules))
  })
})
