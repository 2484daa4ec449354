/**
 * Mould work as planned work: a new mould (take the model or a squeeze of the existing run,
 * run the profile or model the enrichment, make the case, make the rubber or plaster mould) or
 * a repair. Each stage has a lead time in working days; the mould is available from the working
 * day after its last stage ends, unless the lead gives the day (a repair's return date). The
 * stage names follow the usual order of the trade (common practice); the lead times are the
 * shop's own. Pure.
 */

export const MOULD_WORK_STAGES = ['model', 'running', 'case', 'mould'] as const
export type MouldWorkStage = (typeof MOULD_WORK_STAGES)[number]

export const MOULD_WORK_STAGE_LABELS: Record<MouldWorkStage, string> = {
  model: 'Model or squeeze',
  running: 'Running or modelling',
  case: 'Case',
  mould: 'Mould',
}

export interface MouldWorkStageRow {
  stage: MouldWorkStage
  leadDays: number
  done: boolean
  /** hours the stage took (booked to the work's person in the job's cost); absent until written */
  hours?: number
}

const DAY_MS = 86_400_000
const addDays = (day: string, n: number) => new Date(Date.parse(`${day}T00:00:00Z`) + n * DAY_MS).toISOString().slice(0, 10)
const weekday = (day: string) => new Date(`${day}T12:00:00Z`).getUTCDay() || 7

/**
 * The day a mould is available from: `startedOn` plus the lead days of the stages not done,
 * counted on the workshop's working days that are not closed; the mould is ready on the next
 * working day after the last one. No stage left: `startedOn` itself.
 */
export function mouldWorkAvailableFrom(input: {
  startedOn: string
  stages: readonly MouldWorkStageRow[]
  workingDays: readonly number[]
  closedDays?: readonly string[]
}): string {
  const left = input.stages.filter(s => !s.done).reduce((n, s) => n + s.leadDays, 0)
  const closed = new Set(input.closedDays ?? [])
  const open = (d: string) => input.workingDays.includes(weekday(d)) && !closed.has(d)
  let day = input.startedOn
  let counted = 0
  // bounded: a week without a working day would never end (the schemas forbid it; the bound is a guard)
  for (let guard = 0; counted < left && guard < 5000; guard++) {
    if (open(day)) counted++
    day = addDays(day, 1)
  }
  for (let guard = 0; !open(day) && guard < 14; guard++) day = addDays(day, 1)
  return day
}
