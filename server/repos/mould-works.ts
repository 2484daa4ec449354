// Every knex call for mould_works: a mould being made or away for repair.
import type { Knex } from 'knex'
import type { MouldWorkStageRow } from '#shared/utils/mould-work'

export interface MouldWorkRow {
  id: number
  mould_id: number
  kind: 'new' | 'repair'
  stages: MouldWorkStageRow[]
  assigned_to: number | null
  assigned_name: string | null
  started_on: string
  available_from: string
  state: 'open' | 'done'
  notes: string | null
  version: number
}

export interface MouldWorkColumns {
  kind: 'new' | 'repair'
  stages: MouldWorkStageRow[]
  assignedTo: number | null
  startedOn: string
  availableFrom: string
  state: 'open' | 'done'
  notes: string | null
}

const columns = (c: MouldWorkColumns) => ({
  kind: c.kind, stages: JSON.stringify(c.stages), assigned_to: c.assignedTo, started_on: c.startedOn,
  available_from: c.availableFrom, state: c.state, notes: c.notes,
})

export const mouldWorksRepo = {
  /** The mould's open work, or its latest closed one. */
  forMould(db: Knex, workshopId: number, mouldId: number): Promise<MouldWorkRow | undefined> {
    return db('mould_works as w').leftJoin('users as u', function () {
      this.on('u.id', 'w.assigned_to').andOn('u.workshop_id', 'w.workshop_id')
    }).where({ 'w.workshop_id': workshopId, 'w.mould_id': mouldId })
      .select('w.id', 'w.mould_id', 'w.kind', 'w.stages', 'w.assigned_to', 'u.name as assigned_name',
        db.raw(`to_char(w.started_on, 'YYYY-MM-DD') AS started_on`), db.raw(`to_char(w.available_from, 'YYYY-MM-DD') AS available_from`),
        'w.state', 'w.notes', 'w.version')
      .orderByRaw(`(w.state = 'open') DESC, w.id DESC`).first()
  },
  /** Writes the mould's open work (a new row when it has none open). */
  async put(db: Knex, workshopId: number, mouldId: number, c: MouldWorkColumns) {
    const open = await db('mould_works').first('id').where({ workshop_id: workshopId, mould_id: mouldId, state: 'open' }).forUpdate()
    if (open) {
      await db('mould_works').where({ workshop_id: workshopId, id: open.id })
        .update({ ...columns(c), version: db.raw('version + 1'), updated_at: db.fn.now() })
    }
    else await db('mould_works').insert({ workshop_id: workshopId, mould_id: mouldId, ...columns(c) })
  },
  /** Each mould's open work's available-from day, for the planner. */
  openAvailability(db: Knex, workshopId: number): Promise<{ mould_id: number; available_from: string; kind: string }[]> {
    return db('mould_works').select('mould_id', 'kind', db.raw(`to_char(available_from, 'YYYY-MM-DD') AS available_from`))
      .where({ workshop_id: workshopId, state: 'open' })
  },
}
