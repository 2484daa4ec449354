/**
 * Input checks of the planner (planner.ts): every field of PlanPoursInput, with PlanningInputError
 * naming the first bad one. Ranges are sanity bounds (common practice) that keep typos out;
 * the database's own checks are the stricter ones. Pure: no I/O, no framework import.
 */
import type { PlanPoursInput, PlannerCasterCalendar, PlannerDaySpan, PlannerExistingPour, PlannerItem, PlannerMould, PlannerMouldState } from '../types/planner'
import { PlanningInputError, assertPlanningDate, parseShiftClock } from './workshop-calendar'

function plannerNumber(value: unknown, field: string, min: number, max: number, integer = false): number {
  const ok = typeof value === 'number' && Number.isFinite(value) && value >= min && value <= max
    && (!integer || Number.isInteger(value))
  if (!ok) throw new PlanningInputError(field, `${field} must be ${integer ? 'a whole number' : 'a number'} from ${min} to ${max}`)
  return value as number
}

function plannerString(value: unknown, field: string): string {
  if (typeof value !== 'string' || value === '') throw new PlanningInputError(field, `${field} must be a non-empty string`)
  return value
}

function plannerArray<T>(value: unknown, field: string): T[] {
  if (!Array.isArray(value)) throw new PlanningInputError(field, `${field} must be an array`)
  return value as T[]
}

const MOULD_STATES: readonly PlannerMouldState[] = ['ready', 'in_use', 'cleaning', 'repair', 'retired']
const LOCAL_DATE = /^\d{4}-\d{2}-\d{2}$/

function checkMould(m: PlannerMould, i: number): void {
  const f = `moulds[${i}]`
  plannerString(m?.id, `${f}.id`)
  if (typeof m.code !== 'string') throw new PlanningInputError(`${f}.code`, `${f}.code must be a string`)
  if (!MOULD_STATES.includes(m.state)) throw new PlanningInputError(`${f}.state`, `${f}.state must be one of ${MOULD_STATES.join(', ')}`)
  plannerNumber(m.prepMinutes, `${f}.prepMinutes`, 0, 1440)
  plannerNumber(m.cleanMinutes, `${f}.cleanMinutes`, 0, 1440)
  plannerNumber(m.maxDwellMinutes, `${f}.maxDwellMinutes`, 0, 10080)
  plannerNumber(m.pulls, `${f}.pulls`, 0, 1e9, true)
  if (m.expectedPulls !== null) plannerNumber(m.expectedPulls, `${f}.expectedPulls`, 0, 1e9, true)
  if (m.cavities !== undefined) plannerNumber(m.cavities, `${f}.cavities`, 1, 100, true)
  if (m.profileId != null) plannerString(m.profileId, `${f}.profileId`)
  if (m.availableFrom != null) assertPlanningDate(m.availableFrom, `${f}.availableFrom`)
}

function checkItem(it: PlannerItem, i: number): void {
  const f = `items[${i}]`
  plannerString(it?.itemId, `${f}.itemId`)
  plannerString(it.jobId, `${f}.jobId`)
  if (typeof it.jobCode !== 'string') throw new PlanningInputError(`${f}.jobCode`, `${f}.jobCode must be a string`)
  if (it.dueOn !== null && !(typeof it.dueOn === 'string' && LOCAL_DATE.test(it.dueOn))) {
    throw new PlanningInputError(`${f}.dueOn`, `${f}.dueOn must be 'YYYY-MM-DD' or null`)
  }
  if (typeof it.sampleReleased !== 'boolean') throw new PlanningInputError(`${f}.sampleReleased`, `${f}.sampleReleased must be true or false`)
  if (it.depositReleased !== undefined && typeof it.depositReleased !== 'boolean') throw new PlanningInputError(`${f}.depositReleased`, `${f}.depositReleased must be true or false`)
  plannerNumber(it.piecesRemaining, `${f}.piecesRemaining`, 0, 1e6, true)
  plannerArray<string>(it.mouldIds, `${f}.mouldIds`).forEach((id, j) => plannerString(id, `${f}.mouldIds[${j}]`))
  plannerArray<string>(it.alternativeMouldIds ?? [], `${f}.alternativeMouldIds`)
    .forEach((id, j) => plannerString(id, `${f}.alternativeMouldIds[${j}]`))
  if (it.setFactor !== undefined) plannerNumber(it.setFactor, `${f}.setFactor`, 1e-3, 10)
  if (it.profileId != null) plannerString(it.profileId, `${f}.profileId`)
  if (it.readyHours != null) plannerNumber(it.readyHours, `${f}.readyHours`, 0, 24 * 365)
  if (it.fettleShiftHours !== undefined) plannerNumber(it.fettleShiftHours, `${f}.fettleShiftHours`, 0, 24 * 30)
}

function checkExisting(p: PlannerExistingPour, i: number): void {
  const f = `existingPours[${i}]`
  plannerString(p?.mouldId, `${f}.mouldId`)
  const s = assertPlanningDate(p.slotStart, `${f}.slotStart`)
  const e = assertPlanningDate(p.slotEnd, `${f}.slotEnd`)
  if (e.getTime() < s.getTime()) throw new PlanningInputError(`${f}.slotEnd`, `${f}.slotEnd must not be before slotStart`)
  if (p.mixAt != null) assertPlanningDate(p.mixAt, `${f}.mixAt`)
}

function checkSpan(span: PlannerDaySpan, f: string): void {
  if (typeof span !== 'object' || span === null) throw new PlanningInputError(f, `${f} must be an object`)
  for (const k of ['fromDay', 'toDay'] as const) {
    if (typeof span[k] !== 'string' || !LOCAL_DATE.test(span[k])) throw new PlanningInputError(`${f}.${k}`, `${f}.${k} must be 'YYYY-MM-DD'`)
  }
  if (span.toDay < span.fromDay) throw new PlanningInputError(`${f}.toDay`, `${f}.toDay must not be before fromDay`)
}

function checkCasterCalendar(c: PlannerCasterCalendar, f: string): void {
  if (typeof c !== 'object' || c === null) throw new PlanningInputError(f, `${f} must be an object`)
  if (c.workingDays !== undefined) {
    const ok = Array.isArray(c.workingDays) && c.workingDays.every(d => Number.isInteger(d) && d >= 1 && d <= 7)
    if (!ok) throw new PlanningInputError(`${f}.workingDays`, `${f}.workingDays must list ISO weekdays 1 (Mon) to 7 (Sun)`)
  }
  const start = c.shiftStart === undefined ? null : parseShiftClock(c.shiftStart, `${f}.shiftStart`)
  const end = c.shiftEnd === undefined ? null : parseShiftClock(c.shiftEnd, `${f}.shiftEnd`)
  if (start !== null && end !== null && end <= start) throw new PlanningInputError(`${f}.shiftEnd`, `${f}.shiftEnd must be after shiftStart`)
  plannerArray<PlannerDaySpan>(c.absences ?? [], `${f}.absences`).forEach((a, j) => checkSpan(a, `${f}.absences[${j}]`))
  if (c.maxMixes !== undefined) plannerNumber(c.maxMixes, `${f}.maxMixes`, 1, 20, true)
}

/**
 * Checks planPours' input, naming the first bad field (a route can answer 422 with it). Grades
 * and consistencies are left to the plaster model, which checks them when a pour is timed.
 */
export function assertPlanPoursInput(input: PlanPoursInput): void {
  if (typeof input !== 'object' || input === null) throw new PlanningInputError('input', 'input must be an object')
  const from = assertPlanningDate(input.from, 'from')
  if (assertPlanningDate(input.to, 'to').getTime() <= from.getTime()) throw new PlanningInputError('to', 'to must be after from')
  const moulds = plannerArray<PlannerMould>(input.moulds, 'moulds')
  moulds.forEach(checkMould)
  if (new Set(moulds.map(m => m.id)).size !== moulds.length) throw new PlanningInputError('moulds', 'mould ids must be unique')
  plannerArray<PlannerExistingPour>(input.existingPours, 'existingPours').forEach(checkExisting)
  plannerArray<PlannerItem>(input.items, 'items').forEach(checkItem)
  for (const [day, c] of Object.entries(input.shopTempByDay ?? {})) plannerNumber(c, `shopTempByDay.${day}`, -20, 50)
  if (input.defaultShopTempC !== undefined) plannerNumber(input.defaultShopTempC, 'defaultShopTempC', -20, 50)
  const o = input.options ?? {}
  if (o.setFactor !== undefined) plannerNumber(o.setFactor, 'options.setFactor', 1e-3, 10)
  if (o.pourMinutes !== undefined) plannerNumber(o.pourMinutes, 'options.pourMinutes', 0, 1440)
  if (o.projectionDays !== undefined) plannerNumber(o.projectionDays, 'options.projectionDays', 0, 730, true)
  if (o.startAt !== undefined) assertPlanningDate(o.startAt, 'options.startAt')
  if (o.casters !== undefined) plannerArray<string>(o.casters, 'options.casters').forEach((c, j) => plannerString(c, `options.casters[${j}]`))
  for (const [id, c] of Object.entries(o.casterCalendars ?? {})) checkCasterCalendar(c, `options.casterCalendars.${id}`)
  for (const [id, n] of Object.entries(o.benchMaxMixes ?? {})) plannerNumber(n, `options.benchMaxMixes.${id}`, 1, 100, true)
  plannerArray<PlannerDaySpan>(input.closures ?? [], 'closures').forEach((c, j) => checkSpan(c, `closures[${j}]`))
}
