// What is done to a surface in a set, and its words for the screens. Apart from the planner
// (set-plan.ts imports them), so a page that only shows a plan's actions does not load it.
/** What a task does: a patch fill, an undercoat over the whole surface, a thin tight coat over scrim, or the skim. */
export const PLAN_ACTIONS = ['fill', 'undercoat', 'tight-coat', 'skim'] as const
export type PlanAction = (typeof PLAN_ACTIONS)[number]
/** Each action in a word or two, for the screens. */
export const PLAN_ACTION_WORDS: Record<PlanAction, string> = { 'fill': 'Fill', 'tight-coat': 'Tight coat', 'undercoat': 'Undercoat', 'skim': 'Skim' }
