// Every knex call for consumables (scrim, laths, … kept as stock), their ledger of moves
// (consumable_moves: + received, − used by a pour) and the moulds' lists (mould_consumables).
// Stock on hand is the ledger's sum, so two pours deducting at once never lose an update.
import type { Knex } from 'knex'
import type { ConsumableUnit } from '#shared/utils/plaster-fibrous'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const CONSUMABLE_COLUMNS = ['id', 'name', 'unit', 'kg_per_unit', 'archived_at', 'version'] as const

export interface ConsumableRow {
  id: number
  name: string
  unit: ConsumableUnit
  kg_per_unit: number | null
  archived_at: Date | null
  version: number
}

export interface ConsumableInput { name?: string; unit?: ConsumableUnit; kgPerUnit?: number | null; archived?: boolean }

/** A line of a mould's list with its consumable's name, unit and mass. */
export interface MouldConsumableRow { mould_id: number; consumable_id: number; quantity_per_cast: number; name: string; unit: ConsumableUnit; kg_per_unit: number | null }

const LABELS = { ...UNIQUE_LABELS, consumables_workshop_name_unique: 'A consumable with this name already exists' }

function toColumns(i: ConsumableInput, db: Knex) {
  return {
    ...(i.name !== undefined && { name: i.name }),
    ...(i.unit !== undefined && { unit: i.unit }),
    ...(i.kgPerUnit !== undefined && { kg_per_unit: i.kgPerUnit }),
    ...(i.archived !== undefined && { archived_at: i.archived ? db.fn.now() : null }),
  }
}

export const consumablesRepo = {
  /** The consumables with their stock on hand (the ledger's sum), archived last, by name. */
  list(db: Knex, workshopId: number): Promise<(ConsumableRow & { on_hand: number })[]> {
    return db('consumables as c').where('c.workshop_id', workshopId)
      .select(CONSUMABLE_COLUMNS.map(col => `c.${col}`))
      .select(db.raw(`(SELECT coalesce(sum(mv.quantity), 0)::float8 FROM consumable_moves mv
        WHERE mv.workshop_id = c.workshop_id AND mv.consumable_id = c.id) AS on_hand`))
      .orderByRaw('c.archived_at IS NOT NULL, lower(c.name)')
  },
  byId(db: Knex, workshopId: number, id: number): Promise<ConsumableRow | undefined> {
    return db('consumables').first(CONSUMABLE_COLUMNS).where({ workshop_id: workshopId, id })
  },
  /** Which of `ids` are this workshop's consumables. */
  async ownIds(db: Knex, workshopId: number, ids: number[]): Promise<Set<number>> {
    if (!ids.length) return new Set()
    const rows: { id: number }[] = await db('consumables').select('id').where({ workshop_id: workshopId }).whereIn('id', ids)
    return new Set(rows.map(r => Number(r.id)))
  },
  async insert(db: Knex, workshopId: number, input: ConsumableInput): Promise<ConsumableRow> {
    try {
      const [row] = await db('consumables').insert({ workshop_id: workshopId, ...toColumns(input, db) }).returning(CONSUMABLE_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, LABELS)
    }
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: ConsumableInput): Promise<ConsumableRow> {
    return updateVersioned<ConsumableRow>(db, 'consumables', { workshopId, id, version }, toColumns(input, db), CONSUMABLE_COLUMNS, 'Consumable')
  },
  /** Stock received: one + line of the ledger. */
  async receive(db: Knex, workshopId: number, p: { consumableId: number; quantity: number; note: string | null; actorId: number }) {
    await db('consumable_moves').insert({
      workshop_id: workshopId, consumable_id: p.consumableId, kind: 'received', quantity: p.quantity, note: p.note, actor_id: p.actorId,
    })
  },
  /** What a pour used: one − line per consumable (once per pour: a unique index). */
  async use(db: Knex, workshopId: number, p: { pourId: number; actorId: number; at: Date; lines: { consumableId: number; quantity: number }[] }) {
    const rows = p.lines.filter(l => l.quantity > 0).map(l => ({
      workshop_id: workshopId, consumable_id: l.consumableId, kind: 'used', quantity: -l.quantity, pour_id: p.pourId, actor_id: p.actorId, at: p.at,
    }))
    if (rows.length) await db('consumable_moves').insert(rows)
  },
  /** Stock on hand per consumable id. */
  async onHand(db: Knex, workshopId: number, ids: number[]): Promise<Map<number, number>> {
    if (!ids.length) return new Map()
    const rows: { consumable_id: number; on_hand: number }[] = await db('consumable_moves').where({ workshop_id: workshopId })
      .whereIn('consumable_id', ids).groupBy('consumable_id').select('consumable_id', db.raw('sum(quantity)::float8 AS on_hand'))
    return new Map(rows.map(r => [Number(r.consumable_id), Number(r.on_hand)]))
  },
}

export const mouldConsumablesRepo = {
  /** The lists of the given moulds (all the workshop's when `mouldIds` is absent). */
  list(db: Knex, workshopId: number, mouldIds?: number[]): Promise<MouldConsumableRow[]> {
    const q = db('mould_consumables as mc').join('consumables as c', function () {
      this.on('c.id', 'mc.consumable_id').andOn('c.workshop_id', 'mc.workshop_id')
    }).where('mc.workshop_id', workshopId)
      .select('mc.mould_id', 'mc.consumable_id', 'mc.quantity_per_cast', 'c.name', 'c.unit', 'c.kg_per_unit')
      .orderBy(['mc.mould_id', { column: 'c.name' }])
    return mouldIds ? q.whereIn('mc.mould_id', mouldIds) : q
  },
  /** Replaces a mould's list. */
  async replace(db: Knex, workshopId: number, mouldId: number, lines: { consumableId: number; quantityPerCast: number }[]) {
    await db('mould_consumables').where({ workshop_id: workshopId, mould_id: mouldId }).delete()
    if (lines.length) {
      await db('mould_consumables').insert(lines.map(l => ({
        workshop_id: workshopId, mould_id: mouldId, consumable_id: l.consumableId, quantity_per_cast: l.quantityPerCast,
      })))
    }
  },
}
