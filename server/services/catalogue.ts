// Catalogue reads with their computed figures (stock on hand, life warning) and the mould
// state change, which writes the mould and the register in one transaction.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { lotsRepo, type LotInput, type LotRow } from '../repos/plaster-lots'
import { workshopsRepo } from '../repos/workshops'
import { profilesRepo } from '../repos/profiles'
import { mouldsRepo, type MouldEventRow, type MouldInput, type MouldListRow, type MouldPourRow } from '../repos/moulds'
import { recordEvent } from '../repos/events'
import { consumablesRepo, mouldConsumablesRepo, type MouldConsumableRow } from '../repos/consumables'
import { shellLitres } from '#shared/utils/plaster-fibrous'
import { benchesRepo, type BenchInput, type BenchRow } from '../repos/benches'
import { gradeCalibrationRepo, gradesRepo, type GradeInput, type GradeRow } from '../repos/plaster-grades'
import { gradeCalibrationFromRow } from '#shared/utils/catalogue'
import { formatDay, workshopLocale } from '#shared/utils/workshop-format'
import type { Bench, Grade, Lot, LotWithStock, Mould, MouldConsumable, MouldDetail, MouldEvent, MouldPour, Profile } from '#shared/types/catalogue'

/** A timestamp as the wire sends it (what JSON.stringify made of the Date before). */
export const isoOrNull = (d: Date | null): string | null => (d ? d.toISOString() : null)

export function toBench(r: BenchRow): Bench {
  return { id: r.id, name: r.name, kind: r.kind, lengthM: r.length_m, sortOrder: r.sort_order, archivedAt: isoOrNull(r.archived_at), version: r.version, maxMixes: r.max_mixes }
}

export async function listBenches(workshopId: number): Promise<Bench[]> {
  return (await benchesRepo.list(useDb(), workshopId)).map(toBench)
}

export async function createBench(workshopId: number, input: BenchInput): Promise<Bench> {
  return toBench(await benchesRepo.insert(useDb(), workshopId, input))
}

export function toGrade(r: GradeRow): Grade {
  return {
    id: r.id, name: r.name, presetKey: r.preset_key, plaster: plasterGradeFromRow(r), bagKg: r.bag_kg,
    calibration: gradeCalibrationFromRow(r),
    notes: r.notes, archivedAt: isoOrNull(r.archived_at), version: r.version,
  }
}

export async function listGrades(workshopId: number): Promise<Grade[]> {
  return (await gradesRepo.list(useDb(), workshopId)).map(toGrade)
}

export async function createGrade(workshopId: number, input: GradeInput): Promise<Grade> {
  return toGrade(await gradesRepo.insert(useDb(), workshopId, input))
}

export async function updateGrade(workshopId: number, id: number, version: number, input: GradeInput): Promise<Grade> {
  return toGrade(await gradesRepo.update(useDb(), workshopId, id, version, input))
}

/**
 * A lead applies a grade's live calibration (copied, so later demoulds do not move the board
 * until applied again) or withdraws it. Nothing to apply without an attended demould: 422.
 */
export async function applyGradeCalibration(workshopId: number, id: number, version: number, apply: boolean): Promise<Grade> {
  const db = useDb()
  const row = await gradesRepo.byId(db, workshopId, id)
  if (!row) notFound('Plaster grade')
  if (apply && (!row.calibration_count || row.calibration_factor === null)) {
    unprocessable([{ field: 'apply', message: 'Apply: this grade has no demoulds taken inside the attended window yet, so there is nothing to apply' }])
  }
  return toGrade(await gradeCalibrationRepo.apply(db, workshopId, id, version, apply))
}

export async function updateBench(workshopId: number, id: number, version: number, input: BenchInput): Promise<Bench> {
  return toBench(await benchesRepo.update(useDb(), workshopId, id, version, input))
}

export function toLot(r: LotRow): Lot {
  return {
    id: r.id, gradeId: r.grade_id, lotCode: r.lot_code, bagsReceived: r.bags_received, bagKg: r.bag_kg,
    receivedOn: r.received_on, useBy: r.use_by, notes: r.notes, pricePerBag: r.price_per_bag, archivedAt: isoOrNull(r.archived_at), version: r.version,
  }
}

export async function lotsWithStock(workshopId: number): Promise<LotWithStock[]> {
  const db = useDb()
  const [lots, sums, today, ws] = await Promise.all([lotsRepo.list(db, workshopId), lotsRepo.pourSums(db, workshopId), workshopsRepo.today(db, workshopId), workshopsRepo.get(db, workshopId)])
  // the warnings in the workshop's units and day style, as the Lots page and its CSV show them
  const say = ws && { units: ws.units, day: (d: string) => formatDay(d, ws.timezone, workshopLocale(ws.locale)) }
  return lots.map(l => ({
    ...toLot(l),
    gradeName: l.grade_name,
    stock: lotStock({ bagsReceived: l.bags_received, bagKg: l.bag_kg, useBy: l.use_by, today, pours: sums.get(l.id) ?? [], ...say }),
  }))
}

/** A delivery received, or a lot corrected or archived; the grade must be one of the workshop's. */
export async function saveLot(workshopId: number, target: { id: number; version: number } | null, input: LotInput): Promise<Lot> {
  const db = useDb()
  if (input.gradeId && !(await gradesRepo.byId(db, workshopId, input.gradeId))) unprocessable([{ field: 'gradeId', message: 'gradeId is not a plaster grade of this workshop' }])
  return toLot(target ? await lotsRepo.update(db, workshopId, target.id, target.version, input) : await lotsRepo.insert(db, workshopId, input))
}

export const toMouldConsumable = (c: MouldConsumableRow): MouldConsumable => ({
  consumableId: Number(c.consumable_id), name: c.name, unit: c.unit, quantityPerCast: Number(c.quantity_per_cast),
  kgPerUnit: c.kg_per_unit === null ? null : Number(c.kg_per_unit),
})

export function toMould(r: MouldListRow, consumables: MouldConsumableRow[] = []): Mould {
  return {
    cavities: r.cavities, castType: r.cast_type, surfaceAreaM2: r.surface_area_m2, shellThicknessMm: r.shell_thickness_mm,
    consumables: consumables.map(toMouldConsumable),
    id: r.id, benchId: r.bench_id, benchName: r.bench_name, code: r.code, casts: r.casts, material: r.material,
    cavityLitres: r.cavity_litres, castLengthM: r.cast_length_m, prepMinutes: r.prep_minutes, cleanMinutes: r.clean_minutes,
    maxDwellMinutes: r.max_dwell_minutes, pulls: r.pulls, expectedPulls: r.expected_pulls, state: r.state,
    stateChangedBy: r.state_changed_by, stateChangedByName: r.state_changed_by_name, stateChangedAt: isoOrNull(r.state_changed_at),
    stateReason: r.state_reason, version: r.version, life: mouldLife({ pulls: r.pulls, expectedPulls: r.expected_pulls }),
    profile: r.profile_name,
  }
}

function toMouldPour(r: MouldPourRow): MouldPour {
  return {
    id: r.id, state: r.state, mixAt: r.mix_at.toISOString(), demouldedAt: isoOrNull(r.demoulded_at), result: r.result, defect: r.defect,
    isSample: r.is_sample, consistency: r.consistency, jobCode: r.job_code, item: r.item, caster: r.caster, lotCode: r.lot_code,
  }
}

const toMouldEvent = (r: MouldEventRow): MouldEvent => ({ id: r.id, type: r.type, at: r.at.toISOString(), actor: r.actor, data: r.data })

export async function listMoulds(workshopId: number): Promise<Mould[]> {
  const db = useDb()
  const [rows, lists] = await Promise.all([mouldsRepo.list(db, workshopId), mouldConsumablesRepo.list(db, workshopId)])
  return rows.map(r => toMould(r, lists.filter(c => Number(c.mould_id) === Number(r.id))))
}

/** The mould as the list shows it, read again after a write (bench and changer names joined). */
async function mouldById(db: Knex, workshopId: number, id: number): Promise<Mould> {
  const row = await mouldsRepo.byId(db, workshopId, id)
  if (!row) notFound('Mould')
  return toMould(row, await mouldConsumablesRepo.list(db, workshopId, [id]))
}

export async function mouldDetail(workshopId: number, id: number): Promise<MouldDetail> {
  const db = useDb()
  const mould = await mouldById(db, workshopId, id)
  const [pours, events] = await Promise.all([mouldsRepo.pours(db, workshopId, id), mouldsRepo.events(db, workshopId, id)])
  return { ...mould, pours: pours.map(toMouldPour), events: events.map(toMouldEvent) }
}

/**
 * The cast columns after an edit: a fibrous mould needs its face area and shell thickness, and
 * its cavity column holds the shell's litres (area × thickness, plaster-fibrous.ts), so every
 * reader of a mould's litres per piece (drying, the client's date, the item's plaster) gets the
 * shell, not a solid cavity it never fills. A solid mould needs its cavity.
 */
function castColumns(input: MouldInput, before: MouldListRow | undefined): Partial<MouldInput> {
  const castType = input.castType ?? before?.cast_type ?? 'solid'
  const area = input.surfaceAreaM2 !== undefined ? input.surfaceAreaM2 : before?.surface_area_m2 ?? null
  const mm = input.shellThicknessMm !== undefined ? input.shellThicknessMm : before?.shell_thickness_mm ?? null
  if (castType === 'fibrous') {
    const problems = [
      ...(area === null ? [{ field: 'surfaceAreaM2', message: 'surfaceAreaM2 is required for a fibrous mould' }] : []),
      ...(mm === null ? [{ field: 'shellThicknessMm', message: 'shellThicknessMm is required for a fibrous mould' }] : []),
    ]
    if (problems.length) unprocessable(problems)
    return { cavityLitres: Math.round(shellLitres({ surfaceAreaM2: Number(area), shellThicknessMm: Number(mm) }) * 1000) / 1000 }
  }
  if (input.cavityLitres === undefined && !before) unprocessable([{ field: 'cavityLitres', message: 'cavityLitres is required' }])
  return {}
}

/** Replaces a mould's consumables list; each must be one of the workshop's, named once. */
async function replaceMouldConsumables(trx: Knex, workshopId: number, mouldId: number, lines: { consumableId: number; quantityPerCast: number }[]) {
  const ids = lines.map(l => l.consumableId)
  const dup = ids.findIndex((id, i) => ids.indexOf(id) !== i)
  if (dup >= 0) unprocessable([{ field: `consumables[${dup}].consumableId`, message: 'consumableId is listed twice' }])
  const own = await consumablesRepo.ownIds(trx, workshopId, ids)
  const foreign = ids.findIndex(id => !own.has(id))
  if (foreign >= 0) unprocessable([{ field: `consumables[${foreign}].consumableId`, message: 'consumableId is not a consumable of this workshop' }])
  await mouldConsumablesRepo.replace(trx, workshopId, mouldId, lines)
}

/** A new mould, or an edit of one's details; the bench must be one of the workshop's. */
export async function saveMould(actor: Actor, target: { id: number; version: number } | null, input: MouldInput & { profile?: string | null; consumables?: { consumableId: number; quantityPerCast: number }[] }): Promise<Mould> {
  return useDb().transaction(async (trx) => {
    if (input.benchId && !(await benchesRepo.byId(trx, actor.workshopId, input.benchId))) unprocessable([{ field: 'benchId', message: 'benchId is not a bench of this workshop' }])
    // the profile is named in words; a new name makes a new profile
    const { profile, consumables, ...fields } = input
    const columns: MouldInput = profile === undefined
      ? fields
      : { ...fields, profileId: profile === null ? null : await profilesRepo.ensure(trx, actor.workshopId, profile) }
    const before = target ? await mouldsRepo.byId(trx, actor.workshopId, target.id) : undefined
    if (target && !before) notFound('Mould')
    Object.assign(columns, castColumns(columns, before))
    const row = target
      ? await mouldsRepo.update(trx, actor.workshopId, target.id, target.version, columns)
      : await mouldsRepo.insert(trx, actor.workshopId, actor.id, columns)
    if (consumables) await replaceMouldConsumables(trx, actor.workshopId, row.id, consumables)
    return mouldById(trx, actor.workshopId, row.id)
  })
}

export async function setMouldState(actor: Actor, id: number, input: { state: string; reason?: string | null; version: number }): Promise<Mould> {
  return useDb().transaction(async (trx) => {
    const before = await mouldsRepo.byId(trx, actor.workshopId, id)
    if (!before) notFound('Mould')
    await mouldsRepo.setState(trx, actor.workshopId, id, input.version, { state: input.state, reason: input.reason ?? null, actorId: actor.id })
    await recordEvent(trx, {
      workshopId: actor.workshopId, entity: 'mould', entityId: id, type: 'mould.state_changed', actorId: actor.id,
      data: { from: before.state, to: input.state, reason: input.reason ?? null },
    })
    return mouldById(trx, actor.workshopId, id)
  })
}

export async function listProfiles(workshopId: number): Promise<Profile[]> {
  const rows = await profilesRepo.list(useDb(), workshopId)
  return rows.map(r => ({ id: r.id, name: r.name, moulds: r.moulds, readyMoulds: r.ready_moulds }))
}

/** A new profile by name (lead); a name the workshop already has (any case) is that profile. */
export async function createProfile(actor: Actor, name: string): Promise<Profile> {
  const db = useDb()
  const id = await profilesRepo.ensure(db, actor.workshopId, name)
  return (await listProfiles(actor.workshopId)).find(p => p.id === id)!
}
