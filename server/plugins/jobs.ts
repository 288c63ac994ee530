// Background jobs with pg-boss (its schema and queues are installed by scripts/db.mjs as the owner
// role; here it starts with migrate off, as the app's own role). The reminder sweep runs on a
// schedule and when the server starts: for each firm, the invoices due a reminder today are sent
// to the reminder-send queue, one job per invoice and step (singletonKey), and each job sends at
// most one e-mail (server/utils/reminders.ts). Stopped gracefully when the server closes.
import PgBoss from 'pg-boss'
import { sql } from 'drizzle-orm'
import { firms } from '../db/schema'

interface SendJob { firmId: string, invoiceId: string, offsetDays: number }

export default defineNitroPlugin((nitro) => {
  const config = useRuntimeConfig()
  if (!config.jobsEnabled || String(config.jobsEnabled) === 'false' || !config.databaseUrl) return
  const boss = new PgBoss({ connectionString: config.databaseUrl, schema: 'pgboss', migrate: false, max: 3 })
  boss.on('error', err => console.error('[jobs]', err.message))

  async function sweep() {
    const ids = await useDb().transaction(async (tx) => {
      await tx.execute(sql`select set_config('app.job_sweep', 'on', true)`)
      return tx.select({ id: firms.id }).from(firms)
    })
    for (const { id: firmId } of ids) {
      const due = await withFirm({ firmId, userId: null }, f => dueReminders(f))
      for (const d of due) {
        await boss.send('reminder-send', { firmId, ...d } satisfies SendJob, { singletonKey: `${d.invoiceId}:${d.offsetDays}` })
      }
    }
  }

  const ready = (async () => {
    await boss.start()
    await boss.work('reminders-sweep', async () => {
      await sweep()
    })
    await boss.work<SendJob>('reminder-send', async (jobs) => {
      for (const job of jobs) {
        const result = await sendReminder({ firmId: job.data.firmId, userId: null }, job.data.invoiceId, job.data.offsetDays)
        if (result === 'sent') console.log(`[jobs] reminder sent for invoice ${job.data.invoiceId} (${job.data.offsetDays} days)`)
      }
    })
    await boss.schedule('reminders-sweep', config.remindersCron)
    await boss.send('reminders-sweep', {})
  })().catch((err) => {
    console.error('[jobs] not started:', (err as Error).message)
  })

  nitro.hooks.hook('close', async () => {
    await ready
    await boss.stop({ graceful: true, wait: true, timeout: 10_000 }).catch(() => {})
  })
})
