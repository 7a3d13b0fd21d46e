import type { PlanStep } from './coat'

/** Hours a bath stands the coat up for layer work (DESIGN.md §4: work within 48 hours of a bath, common practice). */
export const BATH_WINDOW_HOURS = 48

/** Weeks of plan the "from the plan" action covers when no range is given. */
export const PLAN_TASK_WEEKS = 4

/** The stable key of a plan step, the same on the server and in the pages: dog, date, kind and sorted regions. */
export function planStepKey(dogId: number, step: Pick<PlanStep, 'date' | 'kind' | 'regions'>): string {
  return `${dogId}:${step.date}:${step.kind}:${[...step.regions].sort().join(',')}`
}
