// The lead's home page's read: open jobs by due date, moulds by state, today's pours by state.
import type { Knex } from 'knex'

export async function overviewToday(workshopId: number, db: Knex = useDb()) {
  const ws: { timezone: string; name: string } = await db('workshops').where({ id: workshopId }).first('timezone', 'name')
  const [jobs, moulds, pours] = await Promise.all([
    db('jobs').select('id', 'code', 'title', 'due_on', 'state', 'sample_state')
      .where({ workshop_id: workshopId }).whereIn('state', ['open', 'on_hold'])
      .orderByRaw('due_on NULLS LAST').limit(20),
    db('moulds').select('state').count<{ state: string; count: string }[]>('* as count')
      .where({ workshop_id: workshopId }).groupBy('state'),
    db('pours').select('state').count<{ state: string; count: string }[]>('* as count')
      .where({ workshop_id: workshopId }).whereNot('state', 'void')
      .whereRaw(`(lower(slot) AT TIME ZONE ?)::date = (now() AT TIME ZONE ?)::date`, [ws.timezone, ws.timezone])
      .groupBy('state'),
  ])
  const counts = (rows: { state: string; count: string | number }[]) =>
    Object.fromEntries(rows.map(r => [r.state, Number(r.count)]))
  return { workshop: ws.name, jobs, mouldsByState: counts(moulds), poursTodayByState: counts(pours) }
}
