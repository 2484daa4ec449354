// Crates, deliveries and the proof of delivery.
//
// Crates: a job's ready or packed pieces go into numbered crates (C1, C2… per job); a ready
// piece put in a crate becomes packed (its register entry says which crate). A crate's weight is
// the sum of its pieces' handling weights (the last weighing, else the computed dry mass); over
// the workshop's heaviest crate (workshops.crate_max_kg) it is flagged, not refused: the lead
// knows whether a forklift or crane meets it. A crate on a delivery takes no more pieces.
//
// Deliveries: a lead books crates and loose pieces (long lengths travel uncrated) for a day and
// a vehicle against the job and its site. Every piece must be packed: any other piece is refused
// with its mark and where it stands, all of them in one message. The job's client contacts with
// dispatch mail on are told through the outbox, in the same transaction.
//
// Proof of delivery (a tablet or phone on site): the receiver's name, their signature (PNG from
// the pad), a photo of the load (uploaded to the job first) and the pieces found broken. The
// delivered pieces go on a dispatch note (services/dispatches.ts numbering) and become
// dispatched; a broken piece is rejected like one the finisher rejects, so its item is planned
// again (COUNTED_POUR, server/repos/planning.ts). Exactly once per actionId.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import type {
  ClientDeliveryDto, CrateDto, CrateLabelDto, CratePieceDto, DeliveryBookedDto, DeliveryDto, DeliveryPieceDto, DeliveryProofDto, JobCratesDto,
} from '#shared/types/deliveries'
import { FINISHING_TEAM_LIFT_KG } from '#shared/utils/finishing'
import { FINISHING_STATE_WORDS } from '#shared/utils/finishing-steps'
import { DELIVERY_SIGNATURE_PREFIX, type DeliveryBookInput, type DeliveryCratePackInput, type DeliveryProofInput } from '#shared/utils/delivery-schemas'
import { boardLocalDay } from '#shared/utils/board-rules'
import { jobsRepo } from '../repos/jobs'
import { piecesRepo } from '../repos/pieces'
import { photosRepo } from '../repos/photos'
import { dispatchesRepo } from '../repos/dispatches'
import { cratesRepo, type CrateRow, type LoadPieceRow } from '../repos/crates'
import { deliveriesRepo, type DeliveryRow } from '../repos/deliveries'
import { clientSitesRepo } from '../repos/client-sites'
import { recordEvent } from '../repos/events'
import { runOnce } from './actions'
import { loadWorkshop } from './workshop'
import { notifyDeliveryBooked, notifyDeliverySigned } from './notify'

const round3 = (kg: number) => Math.round(kg * 1000) / 1000
export const crateLabel = (n: number) => `C${n}`

function loadPiece(r: LoadPieceRow): CratePieceDto {
  const kg = round3(Number(r.weighed_kg ?? r.dry_mass_kg))
  return { id: r.id, mark: r.mark, item: r.item, state: r.state, kg, teamLift: kg > FINISHING_TEAM_LIFT_KG }
}

function crateDto(c: CrateRow, pieces: LoadPieceRow[], maxKg: number): CrateDto {
  const mine = pieces.filter(p => p.crate_id === c.id).map(loadPiece)
  const totalKg = round3(mine.reduce((t, p) => t + p.kg, 0))
  return { id: c.id, crateNo: c.crate_no, label: crateLabel(c.crate_no), deliveryId: c.delivery_id, pieces: mine, totalKg, overWeight: totalKg > maxKg }
}

async function jobOf(db: Knex, actor: Actor, jobId: number) {
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job) notFound('Job')
  return job
}

/** GET /api/jobs/:id/crates: the job's crates with contents and weights, and what can still be packed. */
export async function jobCrates(actor: Actor, jobId: number): Promise<JobCratesDto> {
  const db = useDb()
  const job = await jobOf(db, actor, jobId)
  const [crates, maxKg, loose] = await Promise.all([
    cratesRepo.ofJob(db, actor.workshopId, jobId), cratesRepo.maxKg(db, actor.workshopId), cratesRepo.loose(db, actor.workshopId, jobId),
  ])
  const pieces = await cratesRepo.piecesIn(db, actor.workshopId, crates.map(c => c.id))
  return {
    job: { id: Number(job.id), code: job.code, title: job.title }, crateMaxKg: maxKg, teamLiftKg: FINISHING_TEAM_LIFT_KG,
    crates: crates.map(c => crateDto(c, pieces, maxKg)), loose: loose.map(loadPiece),
  }
}

/**
 * Packs pieces into a crate (locked): each must be a piece of the crate's job, ready or packed,
 * and on no delivery; a piece in another crate of the job moves here. 422 names the marks.
 */
async function packInto(trx: Knex, actor: Actor, crate: CrateRow, pieceIds: number[]) {
  if (!pieceIds.length) return
  if (crate.delivery_id) conflict(`Crate ${crateLabel(crate.crate_no)} is booked on a delivery: it takes no more pieces`)
  const locked = await piecesRepo.lockMany(trx, actor.workshopId, pieceIds)
  const rows = await cratesRepo.pieces(trx, actor.workshopId, pieceIds)
  const found = new Set(locked.map(p => p.id))
  const missing = pieceIds.filter(id => !found.has(id))
  if (missing.length) unprocessable([{ field: 'pieceIds', message: `pieceIds names ${missing.length === 1 ? 'a piece' : 'pieces'} this workshop does not have` }])
  const wrongJob = rows.filter(r => r.job_id !== crate.job_id).map(r => r.mark)
  if (wrongJob.length) unprocessable([{ field: 'pieceIds', message: `pieceIds of another job: ${wrongJob.join(', ')}` }])
  const notReady = rows.filter(r => r.state !== 'ready' && r.state !== 'packed').map(r => `${r.mark} (${FINISHING_STATE_WORDS[r.state].toLowerCase()})`)
  if (notReady.length) unprocessable([{ field: 'pieceIds', message: `pieceIds not ready to pack (only ready pieces are packed): ${notReady.join(', ')}` }])
  const booked = await deliveriesRepo.alreadyBooked(trx, actor.workshopId, pieceIds)
  if (booked.length) conflict(`Already on a delivery: ${rows.filter(r => booked.includes(r.id)).map(r => r.mark).join(', ')}`)
  await piecesRepo.packReady(trx, actor.workshopId, rows.filter(r => r.state === 'ready').map(r => r.id))
  await cratesRepo.pack(trx, actor.workshopId, crate.id, pieceIds)
  const at = new Date()
  for (const r of rows) {
    await recordEvent(trx, {
      workshopId: actor.workshopId, entity: 'piece', entityId: r.id, type: r.state === 'ready' ? 'piece.packed' : 'piece.crated', actorId: actor.id, at, backdated: false,
      data: { from: r.state, to: 'packed', mark: r.mark, crateId: crate.id, crate: crateLabel(crate.crate_no) },
    })
  }
}

async function crateAnswer(db: Knex, actor: Actor, crateId: number): Promise<CrateDto> {
  const crate = await cratesRepo.byId(db, actor.workshopId, crateId)
  if (!crate) notFound('Crate')
  const [pieces, maxKg] = await Promise.all([cratesRepo.piecesIn(db, actor.workshopId, [crateId]), cratesRepo.maxKg(db, actor.workshopId)])
  return crateDto(crate, pieces, maxKg)
}

/** POST /api/jobs/:id/crates: a new crate, the pieces given packed into it. */
export async function createCrate(actor: Actor, jobId: number, pieceIds: number[]): Promise<CrateDto> {
  const id = await useDb().transaction(async (trx) => {
    await jobOf(trx, actor, jobId)
    const crate = await cratesRepo.insert(trx, actor.workshopId, jobId, actor.id)
    await packInto(trx, actor, crate, pieceIds)
    return crate.id
  })
  return crateAnswer(useDb(), actor, id)
}

/** POST /api/crates/:id/pieces: more pieces into a crate. */
export async function packCrate(actor: Actor, crateId: number, input: DeliveryCratePackInput): Promise<CrateDto> {
  await useDb().transaction(async (trx) => {
    const crate = await cratesRepo.forUpdate(trx, actor.workshopId, crateId)
    if (!crate) notFound('Crate')
    await packInto(trx, actor, crate, input.pieceIds)
  })
  return crateAnswer(useDb(), actor, crateId)
}

/** GET /api/crates/:id: a crate's label as printed. */
export async function crateLabelView(actor: Actor, crateId: number): Promise<CrateLabelDto> {
  const db = useDb()
  const crate = await crateAnswer(db, actor, crateId)
  const row = (await cratesRepo.byId(db, actor.workshopId, crateId))!
  const [ws, job, maxKg] = await Promise.all([loadWorkshop(db, actor.workshopId), cratesRepo.jobHeading(db, actor.workshopId, row.job_id), cratesRepo.maxKg(db, actor.workshopId)])
  return {
    workshop: ws.name, crateMaxKg: maxKg, teamLiftKg: FINISHING_TEAM_LIFT_KG, crate,
    job: { id: job!.id, code: job!.code, title: job!.title, client: job!.client ?? null, site: job!.site ?? null },
  }
}

/** POST /api/jobs/:id/deliveries: crates and loose pieces booked for a day; the client is told. */
export async function bookDelivery(actor: Actor, jobId: number, input: DeliveryBookInput): Promise<DeliveryBookedDto> {
  return useDb().transaction(async (trx) => {
    const job = await jobOf(trx, actor, jobId)
    const crates = await cratesRepo.lockMany(trx, actor.workshopId, input.crateIds)
    if (crates.length !== input.crateIds.length) unprocessable([{ field: 'crateIds', message: 'crateIds names a crate this workshop does not have' }])
    const otherJob = crates.filter(c => c.job_id !== jobId)
    if (otherJob.length) unprocessable([{ field: 'crateIds', message: `crateIds of another job than ${job.code}: ${otherJob.map(c => crateLabel(c.crate_no)).join(', ')}` }])
    const taken = crates.filter(c => c.delivery_id)
    if (taken.length) conflict(`Already on a delivery: ${taken.map(c => crateLabel(c.crate_no)).join(', ')}`)
    const inCrates = await cratesRepo.piecesIn(trx, actor.workshopId, input.crateIds)
    const empty = crates.filter(c => !inCrates.some(p => p.crate_id === c.id))
    if (empty.length) unprocessable([{ field: 'crateIds', message: `crateIds with nothing packed in them cannot be delivered: ${empty.map(c => crateLabel(c.crate_no)).join(', ')}` }])
    const loosePieces = input.pieceIds.filter(id => !inCrates.some(p => p.id === id))
    await piecesRepo.lockMany(trx, actor.workshopId, [...inCrates.map(p => p.id), ...loosePieces])
    const loose = await cratesRepo.pieces(trx, actor.workshopId, loosePieces)
    if (loose.length !== loosePieces.length) unprocessable([{ field: 'pieceIds', message: 'pieceIds names a piece this workshop does not have' }])
    const wrongJob = loose.filter(p => p.job_id !== jobId)
    if (wrongJob.length) unprocessable([{ field: 'pieceIds', message: `pieceIds of another job than ${job.code}: ${wrongJob.map(p => p.mark).join(', ')}` }])
    const all = [...inCrates, ...loose]
    // every piece that is not packed, named with where it stands: the refusal the lead acts on
    const notReady = all.filter(p => p.state !== 'packed')
    if (notReady.length) {
      unprocessable([{ field: 'pieceIds', message: `pieceIds not ready for delivery: ${notReady.map(p => `${p.mark} (${FINISHING_STATE_WORDS[p.state].toLowerCase()})`).join(', ')}` }])
    }
    const booked = await deliveriesRepo.alreadyBooked(trx, actor.workshopId, all.map(p => p.id))
    if (booked.length) conflict(`Already on a delivery: ${all.filter(p => booked.includes(p.id)).map(p => p.mark).join(', ')}`)
    const siteId = job.site_id === null ? null : Number(job.site_id)
    const id = await deliveriesRepo.insert(trx, actor.workshopId, { jobId, siteId, deliveryDay: input.deliveryDay, fixingOn: input.fixingOn ?? null, vehicle: input.vehicle, by: actor.id })
    const crateNo = new Map(crates.map(c => [c.id, c.crate_no]))
    await deliveriesRepo.addPieces(trx, actor.workshopId, id, all.map(p => ({ pieceId: p.id, crateNo: p.crate_id ? crateNo.get(p.crate_id) ?? null : null })))
    await cratesRepo.book(trx, actor.workshopId, input.crateIds, id)
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'delivery', entityId: id, type: 'delivery.booked', actorId: actor.id, at: new Date(), backdated: false, data: { jobId, deliveryDay: input.deliveryDay, vehicle: input.vehicle, crateIds: input.crateIds, pieceIds: all.map(p => p.id) } })
    const site = siteId ? await clientSitesRepo.byId(trx, actor.workshopId, siteId) : undefined
    const mailed = await notifyDeliveryBooked(trx, actor.workshopId, { id, jobId, day: input.deliveryDay, vehicle: input.vehicle, pieces: all.length, crates: crates.length, site: site?.name ?? job.site ?? null })
    const maxKg = await cratesRepo.maxKg(trx, actor.workshopId)
    const overWeight = crates.map(c => crateDto(c, inCrates, maxKg)).filter(c => c.overWeight).map(c => c.label)
    return { id, pieces: all.length, totalKg: round3(all.map(loadPiece).reduce((t, p) => t + p.kg, 0)), overWeight, mailed }
  })
}

function deliveryPiece(r: LoadPieceRow & { crate_no: number | null; broken: boolean; broken_note: string | null }): DeliveryPieceDto {
  return { ...loadPiece(r), crateNo: r.crate_no, broken: r.broken, brokenNote: r.broken_note }
}

async function deliveryDtos(db: Knex, actor: Actor, rows: DeliveryRow[]): Promise<DeliveryDto[]> {
  const pieces = await deliveriesRepo.pieces(db, actor.workshopId, rows.map(d => d.id))
  const out: DeliveryDto[] = []
  for (const d of rows) {
    const job = await jobsRepo.byId(db, actor.workshopId, d.job_id)
    const site = d.site_id ? await clientSitesRepo.byId(db, actor.workshopId, d.site_id) : undefined
    const mine = pieces.filter(p => p.delivery_id === d.id).map(deliveryPiece)
    out.push({
      id: d.id, job: { id: d.job_id, code: job!.code, title: job!.title },
      site: site ? { name: site.name, address: site.address, postcode: site.postcode ?? null, lifting: site.lifting ?? null } : null,
      deliveryDay: d.delivery_day, fixingOn: d.fixing_on, vehicle: d.vehicle, state: d.state,
      crates: new Set(mine.filter(p => p.crateNo !== null).map(p => p.crateNo)).size, pieces: mine,
      totalKg: round3(mine.reduce((t, p) => t + p.kg, 0)), deliveredAt: d.delivered_at ? new Date(d.delivered_at).toISOString() : null,
      receiverName: d.receiver_name, photoId: d.photo_id, teamLiftKg: FINISHING_TEAM_LIFT_KG, version: d.version,
    })
  }
  return out
}

/** GET /api/jobs/:id/deliveries */
export async function jobDeliveries(actor: Actor, jobId: number): Promise<DeliveryDto[]> {
  const db = useDb()
  await jobOf(db, actor, jobId)
  return deliveryDtos(db, actor, await deliveriesRepo.ofJob(db, actor.workshopId, jobId))
}

/** GET /api/deliveries/:id */
export async function deliveryView(actor: Actor, id: number): Promise<DeliveryDto> {
  const db = useDb()
  const d = await deliveriesRepo.byId(db, actor.workshopId, id)
  if (!d) notFound('Delivery')
  return (await deliveryDtos(db, actor, [d]))[0]!
}

/** A delivery a client may see: of a job they are a member of. */
async function clientDelivery(db: Knex, actor: Actor, id: number) {
  const d = await deliveriesRepo.byId(db, actor.workshopId, id)
  if (!d || !(await jobsRepo.isMember(db, actor.workshopId, d.job_id, actor.id))) notFound('Delivery')
  return d
}

/** GET /api/client/jobs/:id/deliveries: what the client follows of the job's deliveries. */
export async function clientDeliveries(actor: Actor, jobId: number): Promise<ClientDeliveryDto[]> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job || !(await jobsRepo.isMember(db, actor.workshopId, jobId, actor.id))) notFound('Job')
  const dtos = await deliveryDtos(db, actor, await deliveriesRepo.ofJob(db, actor.workshopId, jobId))
  return dtos.map(d => ({
    id: d.id, deliveryDay: d.deliveryDay, fixingOn: d.fixingOn, vehicle: d.vehicle, state: d.state, site: d.site?.name ?? null,
    pieces: d.pieces.length, broken: d.pieces.filter(p => p.broken).length, totalKg: d.totalKg, deliveredAt: d.deliveredAt, receiverName: d.receiverName,
  }))
}

/** POST /api/deliveries/:id/proof: signed for on site (see the header). */
export function proveDelivery(actor: Actor, id: number, input: DeliveryProofInput) {
  return runOnce<DeliveryProofDto>(actor, input.actionId, { kind: 'delivery.proof', entityId: id }, async (trx) => {
    const d = await deliveriesRepo.forUpdate(trx, actor.workshopId, id)
    if (!d) notFound('Delivery')
    if (d.state !== 'booked') conflict('This delivery was already signed for')
    if (input.photoId) {
      const photo = await photosRepo.byId(trx, actor.workshopId, input.photoId)
      if (!photo || Number(photo.job_id) !== d.job_id) unprocessable([{ field: 'photoId', message: 'photoId must be a photo of this job' }])
    }
    const onBoard = (await deliveriesRepo.pieces(trx, actor.workshopId, [id]))
    const locked = await piecesRepo.lockMany(trx, actor.workshopId, onBoard.map(p => p.id))
    const strange = input.broken.filter(b => !onBoard.some(p => p.id === b.pieceId))
    if (strange.length) unprocessable([{ field: 'broken', message: 'broken may only list pieces on this delivery' }])
    const moved = locked.filter(p => p.state !== 'packed')
    if (moved.length) conflict(`Pieces changed since booking: ${moved.map(p => `${p.mark} is ${p.state}`).join(', ')}`)
    const ws = await loadWorkshop(trx, actor.workshopId)
    const at = new Date()
    const brokenIds = new Set(input.broken.map(b => b.pieceId))
    const delivered = locked.filter(p => !brokenIds.has(p.id))
    const noteNo = await dispatchesRepo.nextNoteNo(trx, ws.id, boardLocalDay(at, ws.timezone).slice(0, 4))
    const dispatchId = await dispatchesRepo.insert(trx, ws.id, { jobId: d.job_id, noteNo, at, by: actor.id, notes: `Delivery on ${d.vehicle}, received by ${input.receiverName}` })
    await piecesRepo.dispatch(trx, ws.id, delivered.map(p => p.id), dispatchId)
    for (const p of delivered) {
      await recordEvent(trx, { workshopId: ws.id, entity: 'piece', entityId: p.id, type: 'piece.dispatched', actorId: actor.id, at, backdated: false, data: { from: 'packed', to: 'dispatched', mark: p.mark, dispatchId, noteNo, deliveryId: id } })
    }
    for (const b of input.broken) {
      const p = locked.find(x => x.id === b.pieceId)!
      const reason = `Broken on delivery${b.note ? `: ${b.note}` : ''}`
      if (!(await piecesRepo.step(trx, ws.id, p.id, p.version, { state: 'rejected', reason, dry_by: null }))) conflict(`Piece ${p.mark} was changed by someone else; reload to see it`)
      await recordEvent(trx, { workshopId: ws.id, entity: 'piece', entityId: p.id, type: 'piece.rejected', actorId: actor.id, at, backdated: false, data: { from: 'packed', to: 'rejected', mark: p.mark, reason, pourId: p.pour_id, deliveryId: id, broken: true } })
    }
    await deliveriesRepo.markBroken(trx, ws.id, id, input.broken.map(b => ({ pieceId: b.pieceId, note: b.note ?? null })))
    const signature = Buffer.from(input.signature.slice(DELIVERY_SIGNATURE_PREFIX.length), 'base64')
    await deliveriesRepo.deliver(trx, ws.id, id, { at, receiverName: input.receiverName, signature, photoId: input.photoId ?? null, dispatchId, by: actor.id })
    const broken = locked.filter(p => brokenIds.has(p.id)).map(p => p.mark)
    await recordEvent(trx, { workshopId: ws.id, entity: 'delivery', entityId: id, type: 'delivery.signed', actorId: actor.id, at, backdated: false, data: { receiverName: input.receiverName, broken, noteNo, photoId: input.photoId ?? null } })
    await notifyDeliverySigned(trx, ws.id, { id, jobId: d.job_id, receiverName: input.receiverName, broken })
    return {
      result: { id, delivered: delivered.length, broken, noteNo },
      after: () => {
        emitToJob(ws.id, d.job_id, { type: 'job.progress', id: d.job_id })
      },
    }
  })
}

/** The delivery a signed note is read for: staff of the workshop, or a client member of its job. */
export async function deliveryForNote(actor: Actor, id: number) {
  const db = useDb()
  const d = actor.role === 'client' ? await clientDelivery(db, actor, id) : await deliveriesRepo.byId(db, actor.workshopId, id)
  if (!d) notFound('Delivery')
  const [dto] = await deliveryDtos(db, actor, [d])
  const [ws, heading, signature] = await Promise.all([
    loadWorkshop(db, actor.workshopId), cratesRepo.jobHeading(db, actor.workshopId, d.job_id), deliveriesRepo.signature(db, actor.workshopId, id),
  ])
  const noteNo = d.dispatch_id ? (await dispatchesRepo.byId(db, actor.workshopId, d.dispatch_id))?.note_no ?? null : null
  return { delivery: dto!, workshop: ws, client: heading?.client ?? null, signature, noteNo }
}
