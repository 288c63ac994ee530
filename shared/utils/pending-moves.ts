// Moves the plasterer has made on the phone and not saved yet. Each is a set number as SEEN when
// it was made (after the earlier moves), exactly what PUT /api/jobs/:id/plan takes; the server
// turns them into the planner's numbering one after another (plannerSetNumber). Here the same
// replay gives the moves in the planner's numbering for replan(), so the phone shows what the
// server will keep. Pure: no Vue.
import { plannerSetNumber } from './plan-moves'
import type { SetPlan } from './set-plan'

export interface PendingMove { surfaceId: string, shown: number }

/** The saved moves (planner's numbering) with the pending ones replayed after them, as the server will. */
export function replayMoves(planner: SetPlan, saved: Record<string, number>, pending: PendingMove[]): Record<string, number> {
  const moves = { ...saved }
  for (const m of pending) moves[m.surfaceId] = plannerSetNumber(planner, moves, m.shown)
  return moves
}

const same = (a: Record<string, number>, b: Record<string, number>) =>
  Object.keys(a).length === Object.keys(b).length && Object.entries(a).every(([k, v]) => b[k] === v)

/**
 * The pending list with one more move. A surface moved again replaces its earlier move when the
 * replay still ends the same (so one request saves it); else the move is added after.
 */
export function addMove(planner: SetPlan, saved: Record<string, number>, pending: PendingMove[], move: PendingMove): PendingMove[] {
  const appended = [...pending, move]
  if (!pending.some(m => m.surfaceId === move.surfaceId)) return appended
  const target = replayMoves(planner, saved, appended)
  const others = pending.filter(m => m.surfaceId !== move.surfaceId)
  const before = replayMoves(planner, saved, others)
  // the set number, as seen after the other moves, that puts this surface where it is wanted
  const wanted = target[move.surfaceId]!
  const most = planner.sets.length + Object.keys(target).length + 2
  for (let shown = 1; shown <= most; shown++) {
    if (plannerSetNumber(planner, before, shown) !== wanted) continue
    const rebuilt = [...others, { surfaceId: move.surfaceId, shown }]
    if (same(replayMoves(planner, saved, rebuilt), target)) return rebuilt
  }
  return appended
}

/** The moves as request bodies, in order: a new body wherever a surface would repeat (a body is a record, one move per surface). */
export function movesToSend(pending: PendingMove[]): Record<string, number>[] {
  const bodies: Record<string, number>[] = []
  for (const m of pending) {
    const last = bodies.at(-1)
    if (!last || m.surfaceId in last) bodies.push({ [m.surfaceId]: m.shown })
    else last[m.surfaceId] = m.shown
  }
  return bodies
}
