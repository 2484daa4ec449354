// Consumables kept as stock (scrim, laths, …): the list with stock on hand, a new or edited
// consumable, and stock received (one + line of the ledger, with its register entry).
// A pour's use is deducted at its poured step (services/floor-actions.ts).
import type { Actor } from '../utils/auth'
import { consumablesRepo, type ConsumableInput, type ConsumableRow } from '../repos/consumables'
import { recordEvent } from '../repos/events'
import type { Consumable } from '#shared/types/catalogue'

const isoOrNull = (d: Date | null) => (d ? d.toISOString() : null)

function toConsumable(r: ConsumableRow, onHand: number): Consumable {
  return {
    id: Number(r.id), name: r.name, unit: r.unit, kgPerUnit: r.kg_per_unit === null ? null : Number(r.kg_per_unit),
    onHand, archivedAt: isoOrNull(r.archived_at), version: r.version,
  }
}

export async function listConsumables(workshopId: number): Promise<Consumable[]> {
  return (await consumablesRepo.list(useDb(), workshopId)).map(r => toConsumable(r, Number(r.on_hand)))
}

async function withStock(workshopId: number, row: ConsumableRow): Promise<Consumable> {
  const onHand = await consumablesRepo.onHand(useDb(), workshopId, [Number(row.id)])
  return toConsumable(row, onHand.get(Number(row.id)) ?? 0)
}

/** A new consumable, or an edit (name, unit, mass per unit, archived) of the version the lead saw. */
export async function saveConsumable(workshopId: number, target: { id: number; version: number } | null, input: ConsumableInput): Promise<Consumable> {
  const db = useDb()
  const row = target ? await consumablesRepo.update(db, workshopId, target.id, target.version, input) : await consumablesRepo.insert(db, workshopId, input)
  return withStock(workshopId, row)
}

/** Stock received (lead): added to the ledger and the register in one transaction. */
export async function receiveConsumable(actor: Actor, id: number, input: { quantity: number; note?: string | null }): Promise<Consumable> {
  const row = await useDb().transaction(async (trx) => {
    const c = await consumablesRepo.byId(trx, actor.workshopId, id)
    if (!c) notFound('Consumable')
    if (c.archived_at) conflict(`${c.name} is archived: restore it before receiving stock`)
    await consumablesRepo.receive(trx, actor.workshopId, { consumableId: id, quantity: input.quantity, note: input.note ?? null, actorId: actor.id })
    await recordEvent(trx, {
      workshopId: actor.workshopId, entity: 'consumable', entityId: id, type: 'consumable.received', actorId: actor.id,
      data: { quantity: input.quantity, unit: c.unit, note: input.note ?? null },
    })
    return c
  })
  return withStock(actor.workshopId, row)
}
