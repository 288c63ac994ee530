import { sql } from 'drizzle-orm'

/** Liveness and database reachability, for the start script, the tests and a load balancer. */
export default defineEventHandler(async () => {
  await useDb().execute(sql`select 1`)
  return { ok: true }
})
