// A job's set log entries on the server: the checks an entry's fields get against the job (its
// plan, people and materials), who may correct or remove one, and what an entry was (for the audit).
import { asc, eq, inArray, sql } from 'drizzle-orm'
import type { z } from 'zod'
import { jobs, materials, materialUses, setLogs } from '../db/schema'
import type { setLogSchema } from '#shared/schemas/job'
import { mayChangeLog, taskKey } from '#shared/utils/set-log'

export type SetLogInput = z.output<typeof setLogSchema>
export type SetLogRow = typeof setLogs.$inferSelect

const CLOSED = ['invoiced', 'paid', 'cancelled']

/** 409 for a job that takes no more logging (invoiced, paid or cancelled). */
export function assertJobOpen(job: JobRow) {
  if (CLOSED.includes(job.status)) {
    throw createError({ statusCode: 409, statusMessage: 'Job closed', data: { message: `The job is ${JOB_STATUS_LABELS[job.status].toLowerCase()}: its set log is kept as it is.` } })
  }
}

/**
 * An entry's fields against the job: the surfaces are the job's, the set is on the plan, each task
 * ticked is on that set of the plan (`tasks.N`), the people are the firm's, the materials its own.
 * Answers each material's pack cost today.
 */
export async function checkLogInput(f: FirmScope, job: JobRow, input: SetLogInput) {
  const { plan } = await jobPlan(f, job)
  const known = new Set(plan.sets.flatMap(s => s.tasks.map(t => t.surfaceId)))
  const unknown = input.surfaceIds.findIndex(s => !known.has(s))
  if (unknown >= 0) throw fieldError({ [`surfaceIds.${unknown}`]: 'That surface is not on this job.' })
  if (input.setNumber !== null && input.setNumber > plan.sets.length) throw fieldError({ setNumber: `The plan has ${plan.sets.length} sets.` })
  if (input.tasks.length) {
    const set = input.setNumber === null ? undefined : plan.sets.find(s => s.number === input.setNumber)
    const onSet = new Set(set?.tasks.map(taskKey) ?? [])
    const off = input.tasks.findIndex(t => !onSet.has(taskKey(t)))
    if (off >= 0) throw fieldError({ [`tasks.${off}`]: set ? `That task is not on set ${set.number} of the plan.` : 'Tasks are ticked on a set of the plan: choose the set.' })
  }
  await checkMembers(f, input.userIds, 'userIds.#')
  const ids = input.materials.map(m => m.materialId)
  const rows = ids.length ? await f.tx.select({ id: materials.id, costPence: materials.costPence }).from(materials).where(f.where(materials, inArray(materials.id, ids))) : []
  const missing = input.materials.findIndex(m => !rows.some(r => r.id === m.materialId))
  if (missing >= 0) throw fieldError({ [`materials.${missing}.materialId`]: 'Choose one of the firm\'s materials.' })
  return { prices: new Map(rows.map(r => [r.id, r.costPence])) }
}

/** The columns of an entry from its checked fields (the times as instants; who laid it on: the sender when none are named). */
export function logColumns(input: SetLogInput, senderId: string) {
  const { materials: _m, startedAt, endedAt, clientId: _c, ...rest } = input
  return {
    ...rest,
    userIds: rest.userIds.length ? rest.userIds : [senderId],
    startedAt: startedAt ? new Date(startedAt) : null,
    endedAt: endedAt ? new Date(endedAt) : null,
  }
}

/** The bags mixed for an entry, written afresh: each at `costOf` its material. */
export async function writeMaterialUses(f: FirmScope, jobId: string, logId: string, used: SetLogInput['materials'], costOf: (materialId: string) => number) {
  if (!used.length) return
  await f.tx.insert(materialUses).values(used.map(m => f.values({ jobId, logId, materialId: m.materialId, packsX1000: m.packsX1000, costPencePerPack: costOf(m.materialId) })))
}

/** What an entry is, for the audit log: its fields and the bags mixed (with the cost per pack kept). */
export async function logSnapshot(f: FirmScope, log: SetLogRow) {
  const uses = await f.tx.select({ materialId: materialUses.materialId, packsX1000: materialUses.packsX1000, costPencePerPack: materialUses.costPencePerPack })
    .from(materialUses).where(f.where(materialUses, eq(materialUses.logId, log.id))).orderBy(asc(materialUses.materialId))
  return {
    kind: log.kind, setNumber: log.setNumber, coat: log.coat, tasks: log.tasks, surfaceIds: log.surfaceIds, userIds: log.userIds,
    startedAt: log.startedAt?.toISOString() ?? null, endedAt: log.endedAt?.toISOString() ?? null,
    coldOrDamp: log.coldOrDamp, notes: log.notes, loggedBy: log.loggedBy, materials: uses,
  }
}

/**
 * The entry the path names, locked (FOR UPDATE) for a correction or removal, with its job. 404 when
 * the job or the entry is not one the person may see (another firm's, or crew not on the job); 409
 * on a closed job; 403 unless the person logged it and it is still the London day it was logged,
 * or is the owner. The lock makes a correction and a removal racing each other one after the other.
 */
export async function logToChange(f: FirmScope, auth: FirmContext, jobId: string, logId: string) {
  const job = await findJob(f, auth, jobId)
  const [log] = await f.tx.select().from(setLogs).where(f.where(setLogs, eq(setLogs.id, logId), eq(setLogs.jobId, jobId))).for('update')
  if (!log) throw notFound()
  assertJobOpen(job)
  if (!mayChangeLog(auth, log, job.status)) {
    throw createError({
      statusCode: 403,
      statusMessage: 'Not yours to change',
      data: { message: log.loggedBy === auth.userId ? 'An entry can be corrected or removed by the person who logged it on the day it was logged; after that, ask the owner.' : 'Only the person who logged this entry (on the day) or the owner can correct or remove it.' },
    })
  }
  return { job, log }
}

/** The job was changed: its updatedAt moves on. */
export async function touchJob(f: FirmScope, jobId: string) {
  await f.tx.update(jobs).set({ updatedAt: sql`now()` }).where(f.where(jobs, eq(jobs.id, jobId)))
}

/** An entry this firm already holds under the phone's id, or undefined. */
export async function logByClientId(f: FirmScope, clientId: string) {
  const [row] = await f.tx.select({ id: setLogs.id, jobId: setLogs.jobId }).from(setLogs).where(f.where(setLogs, eq(setLogs.clientId, clientId)))
  return row
}
