/**
 * Run the reminder schedule for this firm now (the background job does it every quarter hour):
 * each owing invoice gets the reminder of the step it has reached, once. Answers what was sent.
 */
export default defineEventHandler(async (event) => {
  const auth = await requireAuth(event, 'money:write')
  const due = await withFirm(auth, f => dueReminders(f))
  const results = []
  for (const d of due) results.push({ ...d, result: await sendReminder({ firmId: auth.firmId, userId: null }, d.invoiceId, d.offsetDays) })
  return { results }
})
