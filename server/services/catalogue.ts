// Catalogue reads with their computed figures (stock on hand, life warning) and the mould
// state change, which writes the mould and the register in one transaction.
import type { Actor } from '../utils/auth'
import { lotsRepo, workshopToday } from '../repos/plaster-lots'
import { mouldsRepo, type MouldRow } from '../repos/moulds'
import { recordEvent } from '../repos/events'

export async function lotsWithStock(workshopId: number) {
  const db = useDb()
  const [lots, sums, today] = await Promise.all([lotsRepo.list(db, workshopId), lotsRepo.pourSums(db, workshopId), workshopToday(db, workshopId)])
  return lots.map(l => ({
    ...l,
    stock: lotStock({ bagsReceived: l.bags_received, bagKg: l.bag_kg, useBy: l.use_by, today, pours: sums.get(l.id) ?? [] }),
  }))
}

export function withLife<T extends Pick<MouldRow, 'pulls' | 'expected_pulls'>>(m: T) {
  return { ...m, life: mouldLife({ pulls: m.pulls, expectedPulls: m.expected_pulls }) }
}

export async function mouldDetail(workshopId: number, id: number) {
  const db = useDb()
  const mould = await mouldsRepo.byId(db, workshopId, id)
  if (!mould) notFound('Mould')
  const [pours, events] = await Promise.all([mouldsRepo.pours(db, workshopId, id), mouldsRepo.events(db, workshopId, id)])
  return { ...withLife(mould), pours, events }
}

export async function setMouldState(actor: Actor, id: number, input: { state: string; reason?: string | null; version: number }) {
  return useDb().transaction(async (trx) => {
    const before = await mouldsRepo.byId(trx, actor.workshopId, id)
    if (!before) notFound('Mould')
    const row = await mouldsRepo.setState(trx, actor.workshopId, id, input.version, { state: input.state, reason: input.reason ?? null, actorId: actor.id })
    await recordEvent(trx, {
      workshopId: actor.workshopId, entity: 'mould', entityId: id, type: 'mould.state_changed', actorId: actor.id,
      data: { from: before.state, to: input.state, reason: input.reason ?? null },
    })
    return withLife(row)
  })
}
