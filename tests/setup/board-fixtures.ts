// Fixtures for the pour board's API tests: moulds, jobs, items and lots of their own in the
// demo workshop (codes made unique per call), so tests never touch the demo's rows.
import { randomUUID } from 'node:crypto'
import { demo, demoWorkshopId, testDb } from './fixtures'

export async function boardFixture(label: string) {
  const k = testDb()
  const workshopId = await demoWorkshopId()
  const tag = `${label}-${randomUUID().slice(0, 6)}`
  let n = 0
  const id = async (table: string, row: Record<string, unknown>) => {
    const [r] = await k(table).insert({ workshop_id: workshopId, ...row }).returning('id')
    return Number(r.id)
  }
  const grade = await k('plaster_grades').where({ workshop_id: workshopId, preset_key: 'beta-casting' }).first()
  const gradeId = Number(grade.id)
  const benchId = await id('benches', { name: `Bench ${tag}`, sort_order: 90 })
  const casterRow = await k('users').where({ email: demo.caster1.email }).first('id', 'name')
  const caster2Row = await k('users').where({ email: demo.caster2.email }).first('id', 'name')
  return {
    k, workshopId, tag, grade, gradeId, benchId,
    casterId: Number(casterRow.id), casterName: casterRow.name as string, caster2Id: Number(caster2Row.id),
    mould: (row: Record<string, unknown> = {}) => id('moulds', {
      bench_id: benchId, code: `${tag}-M${++n}`, casts: `Test cast ${n}`, material: 'silicone', cavity_litres: 2,
      prep_minutes: 10, clean_minutes: 10, max_dwell_minutes: 240, pulls: 0, expected_pulls: 100, ...row,
    }),
    job: (row: Record<string, unknown> = {}) => id('jobs', { code: `${tag}-J${++n}`, title: `Job ${tag}`, ...row }),
    item: (jobId: number, mouldId: number | null, row: Record<string, unknown> = {}) => id('job_items', {
      job_id: jobId, mould_id: mouldId, description: `Item ${tag} ${++n}`, pieces_needed: 4, grade_id: gradeId, consistency: 70, ...row,
    }),
    lot: (row: Record<string, unknown> = {}) => id('plaster_lots', {
      grade_id: gradeId, lot_code: `${tag}-L${++n}`, bags_received: 10, bag_kg: 25, received_on: '2026-01-01', ...row,
    }),
  }
}

/**
 * A timezone where it is now between 04:00 and 20:00: journeys whose pours start up to 90
 * minutes ago see them on the floor's local today, which near midnight would be yesterday.
 * One of these offsets (0, −5, −8, −10, +5:30, +9, +10) is always far from midnight.
 */
export function zoneAwayFromMidnight(now = new Date()): string {
  const zones = ['Europe/London', 'America/New_York', 'America/Los_Angeles', 'Pacific/Honolulu', 'Asia/Kolkata', 'Asia/Tokyo', 'Australia/Brisbane']
  const hour = (zone: string) => Number(new Intl.DateTimeFormat('en-GB', { hour: '2-digit', hourCycle: 'h23', timeZone: zone }).format(now))
  return zones.find(z => hour(z) >= 4 && hour(z) < 20)!
}
