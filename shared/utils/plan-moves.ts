// The plasterer moves a surface to another set by hand: its skim goes to that set (its fill,
// undercoat and tight coats stay where the planner put them), empty sets close up, every task's
// reason is worked out again from the plan as it now stands (reasonsForPlan in ./set-plan.ts), and
// the plan is checked again (checkPlan) so each rule the move breaks shows as a warning. Not
// blocked: the plasterer decides.
import type { PlanCorner, PlannedSet, PlanOptions, PlanSurface, PlanTask, SetPlan } from './set-plan'
import { checkPlan, reasonsForPlan } from './set-plan'

/** What the plan was made from: `replan` reads it to work every reason out again. */
export interface PlanMoveInputs { surfaces: PlanSurface[], corners: PlanCorner[], options: PlanOptions, labels: Record<string, string> }

/**
 * The planner's plan with the plasterer's moves (surface id -> set number in the planner's
 * numbering) applied: empty sets close up, every task's reason is worked out again from where the
 * tasks are now (a moved skim says it was moved by hand, and what holds where it is), and each
 * rule a move breaks is a warning. Used alike by the server and by the phone, so the picture and
 * the list update at once. No moves: the planner's plan as it is.
 */
export function replan(planner: SetPlan, moves: Record<string, number>, inputs: PlanMoveInputs): SetPlan {
  if (!Object.keys(moves).length) return planner
  const { sets, warnings, movedFrom } = placeSkims(planner, moves, inputs.labels)
  const kept = sets.filter(s => s.tasks.length)
  const plan: SetPlan = {
    sets: kept.map((s, i) => ({ number: i + 1, tasks: s.tasks, bags: s.tasks.reduce((sum, t) => sum + tenths(t.bags), 0) / 10 })),
    warnings: [...planner.warnings, ...warnings],
  }
  const moved = [...movedFrom.keys()].map(t => t.surfaceId)
  const explained = reasonsForPlan(inputs.surfaces, inputs.corners, inputs.options, plan, inputs.labels, moved)
  const broken = checkPlan(inputs.surfaces, inputs.corners, inputs.options, explained, inputs.labels)
  return { ...explained, warnings: [...new Set([...explained.warnings, ...broken])] }
}

const tenths = (bags: number) => Math.round(bags * 10)

/**
 * Moves are kept in the planner's own set numbers, but people see the plan after empty sets have
 * closed up. The planner's number of the set someone sees as `shown` (after the moves already
 * made): a number past the last set is a new set at the end.
 */
export function plannerSetNumber(plan: SetPlan, moves: Record<string, number>, shown: number): number {
  if (!Number.isInteger(shown) || shown < 1) throw new RangeError(`a set number is a whole number from 1, got ${shown}`)
  const raw = placeSkims(plan, moves).sets
  const used = raw.map((s, i) => (s.tasks.length ? i + 1 : 0)).filter(n => n > 0)
  return shown <= used.length ? used[shown - 1]! : raw.length + (shown - used.length)
}

/** The plan with each surface's skim in the set named by `moves` (surface id -> set number). */
export function applyMoves(plan: SetPlan, moves: Record<string, number>, labels: Record<string, string> = {}): SetPlan {
  const { sets, warnings, movedFrom } = placeSkims(plan, moves, labels)
  const kept = sets.filter(s => s.tasks.length)
  // the reason names the set the task ends up in, after empty sets have closed up
  const reasoned = (t: PlanTask, number: number): PlanTask => {
    const was = movedFrom.get(t)
    return was === undefined ? t : { ...t, reason: `Moved to set ${number} by hand (the planner had it in set ${was}).` }
  }
  return {
    sets: kept.map((s, i) => ({ number: i + 1, tasks: s.tasks.map(t => reasoned(t, i + 1)), bags: s.tasks.reduce((sum, t) => sum + tenths(t.bags), 0) / 10 })),
    warnings: [...plan.warnings, ...warnings],
  }
}

/** Each moved skim in its set, in the planner's numbering, before empty sets close up. */
function placeSkims(plan: SetPlan, moves: Record<string, number>, labels: Record<string, string> = {}) {
  const sets: { tasks: PlannedSet['tasks'] }[] = plan.sets.map(s => ({ tasks: s.tasks.map(t => ({ ...t })) }))
  const warnings: string[] = []
  /** Tasks moved by hand, with the set the planner had them in. */
  const movedFrom = new Map<PlanTask, number>()
  for (const [surfaceId, to] of Object.entries(moves)) {
    if (!Number.isInteger(to) || to < 1) throw new RangeError(`a set number is a whole number from 1, got ${to} for ${surfaceId}`)
    const from = sets.findIndex(s => s.tasks.some(t => t.surfaceId === surfaceId && t.action === 'skim'))
    if (from < 0) {
      warnings.push(`${labels[surfaceId] ?? surfaceId} is not in the plan any more, so its move was left out.`)
      continue
    }
    if (from === to - 1) continue
    const task = sets[from]!.tasks.find(t => t.surfaceId === surfaceId && t.action === 'skim')!
    sets[from]!.tasks = sets[from]!.tasks.filter(t => t !== task)
    while (sets.length < to) sets.push({ tasks: [] })
    sets[to - 1]!.tasks.push(task)
    movedFrom.set(task, from + 1)
  }
  return { sets, warnings, movedFrom }
}
