// The caster's pour actions on the floor: start mixing → poured → demoulded, each exactly once
// (services/step-machine.ts), in one transaction with its register entry. The server is the judge of
// the order of steps and of the version the tablet saw.
import type { Actor } from '../utils/auth'
import type { FloorActionInput } from '#shared/utils/floor-schemas'
import { FLOOR_STEPS } from '#shared/utils/floor-steps'
import { poursRepo, pourFactsRepo, type PourStepRow } from '../repos/pours'
import { mouldFloorRepo } from '../repos/moulds'
import { piecesRepo } from '../repos/pieces'
import { paymentsRepo } from '../repos/payments'
import { recordEvent } from '../repos/events'
import { gradeCalibrationRepo } from '../repos/plaster-grades'
import { shopDaysRepo } from '../repos/shop-days'
import { castFromBatch, slurryTemperature } from '#shared/utils/plaster'
import { consumablesForPour, mouldCastFromRow, pieceMasses, piecesPerPour } from '#shared/utils/plaster-fibrous'
import { jobPieceMarks, markRange, stockPieceMarks } from '#shared/utils/piece-marks'
import { consumablesRepo, mouldConsumablesRepo } from '../repos/consumables'
import { calibrationFromPours } from '#shared/utils/plaster-set'
import { POUR_MIX_MINUTES_DEFAULT, pourSetMinutes, pourTiming } from '#shared/utils/pour-timing'
import { demouldTiming } from '#shared/utils/pour-status'
import { POUR_WASTE_PCT, boardLocalDay } from '#shared/utils/board-rules'
import { runStep, writeStep, type StepContext as Step, type StepMachine } from './step-machine'
import { loadWorkshop } from './workshop'
import { floorCards } from '../queries/floor-today'
import type { FloorActionResult } from '#shared/types/floor'

const MINUTE_MS = 60_000

type StepContext = Step<PourStepRow>
type MadePiece = { id: number; mark: string }[] | null

async function gradeAndMould(c: StepContext) {
  const grade = await pourFactsRepo.grade(c.trx, c.actor.workshopId, c.row.grade_id)
  const mould = await mouldFloorRepo.forStep(c.trx, c.actor.workshopId, c.row.mould_id)
  return { grade, gradeModel: plasterGradeFromRow(grade), mould }
}

function write(c: StepContext, type: string, patch: Record<string, unknown>, data: Record<string, unknown>) {
  return writeStep(c, {
    update: (trx, workshopId, id, version) => poursRepo.step(trx, workshopId, id, version, { ...patch, ...(c.backdated ? { backdated: true } : {}) }),
    changed: 'This pour was changed by someone else; reload to see it',
    entity: 'pour', type, data,
  })
}

async function startMixing(c: StepContext, input: Extract<FloorActionInput, { kind: 'start_mixing' }>) {
  const { gradeModel, mould } = await gradeAndMould(c)
  if (mould.state === 'repair' || mould.state === 'retired') conflict(`Mould ${mould.code} is in ${mould.state}: ask the lead before casting in it`)
  // the deposit gate: a job's moulds are not started before its deposit is paid
  const waiting = c.row.job_item_id ? await paymentsRepo.depositWaitingForItem(c.trx, c.actor.workshopId, c.row.job_item_id) : null
  if (waiting) conflict(`Job ${waiting} waits for its deposit: do not start this pour until the deposit is paid; ask the lead`)
  const lotId = input.lotId === undefined ? c.row.lot_id : input.lotId
  if (lotId) {
    const lot = await pourFactsRepo.lot(c.trx, c.actor.workshopId, lotId)
    if (!lot || Number(lot.grade_id) !== Number(c.row.grade_id)) unprocessable([{ field: 'lotId', message: 'is not a lot of this pour\'s plaster grade' }])
  }
  const ws = await loadWorkshop(c.trx, c.actor.workshopId)
  const shopTempC = (await shopDaysRepo.tempOn(c.trx, ws.id, boardLocalDay(c.at, ws.timezone))) ?? Number(ws.default_shop_temp_c)
  const powderTempC = input.powderTempC ?? shopTempC
  const plasterKg = Number(c.row.plaster_kg_planned)
  const waterKg = Number(c.row.water_kg_planned)
  const slurryTempC = slurryTemperature({ plasterKg, waterKg, waterTempC: input.waterTempC, powderTempC })
  // the clock restarts at the real start of mixing, on the planned batch until the pour's weights are in
  const t = pourTiming({
    mixAt: c.at, grade: gradeModel, consistency: Number(c.row.consistency), slurryTempC, setFactor: Number(c.row.set_factor),
    mould: { prepMinutes: mould.prep_minutes, cleanMinutes: mould.clean_minutes, maxDwellMinutes: mould.max_dwell_minutes },
  })
  await write(c, 'pour.mixing', {
    state: 'mixing', mixing_at: c.at, lot_id: lotId ?? null, water_temp_c: input.waterTempC, powder_temp_c: powderTempC,
    slurry_temp_c: slurryTempC, demould_open_at: t.demouldOpenAt, demould_close_at: t.demouldCloseAt,
  }, { lotId: lotId ?? null, waterTempC: input.waterTempC, powderTempC, slurryTempC, demouldOpenAt: t.demouldOpenAt, demouldCloseAt: t.demouldCloseAt })
  // starting the next pour is where the caster has cleaned the mould: cleaning (or ready) → in use
  await mouldFloorRepo.moveState(c.trx, c.actor.workshopId, mould.id, 'in_use', c.actor.id)
  return null
}

async function poured(c: StepContext, input: Extract<FloorActionInput, { kind: 'poured' }>) {
  const { gradeModel, mould } = await gradeAndMould(c)
  const consistency = (100 * input.waterKg) / input.plasterKg
  castFromBatch({ plasterKg: input.plasterKg, waterKg: input.waterKg, grade: gradeModel })
  const waterTempC = input.waterTempC ?? (c.row.water_temp_c === null ? input.shopTempC : Number(c.row.water_temp_c))
  const powderTempC = c.row.powder_temp_c === null ? input.shopTempC : Number(c.row.powder_temp_c)
  const slurryTempC = slurryTemperature({ plasterKg: input.plasterKg, waterKg: input.waterKg, waterTempC, powderTempC })
  const timing = { grade: gradeModel, consistency, slurryTempC }
  const t = pourTiming({
    ...timing, mixAt: c.row.mixing_at!, setFactor: Number(c.row.set_factor),
    mould: { prepMinutes: mould.prep_minutes, cleanMinutes: mould.clean_minutes, maxDwellMinutes: mould.max_dwell_minutes },
  })
  // the model's own prediction (set factor 1), so calibration compares actual with the bare model
  const predicted = pourSetMinutes({ ...timing, setFactor: 1 }).openAfterMix
  await write(c, 'pour.poured', {
    state: 'setting', poured_at: c.at, plaster_kg_actual: input.plasterKg, water_kg_actual: input.waterKg, shop_temp_c: input.shopTempC,
    water_temp_c: waterTempC, slurry_temp_c: slurryTempC, demould_open_at: t.demouldOpenAt, demould_close_at: t.demouldCloseAt,
    predicted_demould_minutes: predicted,
  }, { plasterKg: input.plasterKg, waterKg: input.waterKg, consistency, shopTempC: input.shopTempC, waterTempC, slurryTempC, predictedMinutes: predicted, demouldOpenAt: t.demouldOpenAt, demouldCloseAt: t.demouldCloseAt })
  // the mould's consumables (scrim, laths, …) leave the stock once the pour is in: per cast × cavities
  const list = await mouldConsumablesRepo.list(c.trx, c.actor.workshopId, [mould.id])
  const used = consumablesForPour(list.map(r => ({ consumableId: Number(r.consumable_id), name: r.name, unit: r.unit, quantityPerCast: Number(r.quantity_per_cast) })), mouldCastFromRow(mould))
  await consumablesRepo.use(c.trx, c.actor.workshopId, { pourId: c.row.id, actorId: c.actor.id, at: c.at, lines: used.map(u => ({ consumableId: Number(u.consumableId), quantity: u.quantity })) })
  return null
}

/**
 * The marks of a pour's pieces, one per cavity, in the one scheme of shared/utils/piece-marks.ts.
 * A lead may have reset a mould's pull count: the pour id keeps a stock mark unique then.
 */
async function pieceMarks(c: StepContext, mould: { code: string; pulls: number }, count: number): Promise<string[]> {
  const item = c.row.job_item_id ? await pourFactsRepo.item(c.trx, c.actor.workshopId, c.row.job_item_id) : undefined
  if (!item) {
    const marks = stockPieceMarks(mould.code, mould.pulls + 1, count)
    return (await piecesRepo.markTaken(c.trx, c.actor.workshopId, marks[0]!)) ? marks.map(m => `${m}-P${c.row.id}`) : marks
  }
  const next = await piecesRepo.nextInJob(c.trx, c.actor.workshopId, Number(item.job_id), item.job_code)
  return jobPieceMarks(item.job_code, next, count)
}

async function demoulded(c: StepContext, input: Extract<FloorActionInput, { kind: 'demoulded' }>) {
  const { gradeModel, mould } = await gradeAndMould(c)
  const actualMinutes = (c.at.getTime() - c.row.mixing_at!.getTime()) / MINUTE_MS
  // the cast holds the batch less what stayed in the bowl and on the spill (the board's waste allowance)
  const keep = 1 + POUR_WASTE_PCT / 100
  const cast = castFromBatch({ plasterKg: Number(c.row.plaster_kg_actual) / keep, waterKg: Number(c.row.water_kg_actual) / keep, grade: gradeModel })
  // one piece per cavity, each its share of the cast plus the scrim and laths it carries
  const mouldCast = mouldCastFromRow(mould)
  const carried = mouldCast.castType === 'fibrous'
    ? (await mouldConsumablesRepo.list(c.trx, c.actor.workshopId, [mould.id])).map(r => ({
        consumableId: Number(r.consumable_id), name: r.name, unit: r.unit, quantityPerCast: Number(r.quantity_per_cast), kgPerUnit: r.kg_per_unit === null ? null : Number(r.kg_per_unit),
      }))
    : []
  const masses = pieceMasses({ cast, mould: mouldCast, consumables: carried })
  const marks = await pieceMarks(c, mould, piecesPerPour(mouldCast))
  const mark = markRange(marks)
  // early: the caster was asked on the tablet and went on; early and late stay out of calibration
  const timing = demouldTiming({ demouldOpenAt: c.row.demould_open_at, demouldCloseAt: c.row.demould_close_at }, c.at)
  await write(c, 'pour.demoulded', {
    state: 'demoulded', demoulded_at: c.at, result: input.result, defect: input.result === 'defect' ? input.defect : null,
    notes: input.notes ?? null, actual_demould_minutes: actualMinutes, demould_timing: timing,
  }, { result: input.result, defect: input.defect ?? null, notes: input.notes ?? null, actualMinutes, predictedMinutes: Number(c.row.predicted_demould_minutes), mark, timing })
  // a defect goes to the finisher as a repair to judge (repair or reject); a sound cast to fettling
  const pieces: { id: number; mark: string }[] = []
  for (const [i, pieceMark] of marks.entries()) {
    const piece = await piecesRepo.insert(c.trx, c.actor.workshopId, {
      pourId: c.row.id, jobItemId: c.row.job_item_id, mark: pieceMark, cavity: i + 1, dryMassKg: masses.dryMassKg, wetMassKg: masses.wetMassKg,
      state: input.result === 'sound' ? 'to_fettle' : 'repair',
    })
    await recordEvent(c.trx, { workshopId: c.actor.workshopId, entity: 'piece', entityId: piece.id, type: 'piece.created', actorId: c.actor.id, at: c.at, backdated: c.backdated, data: { pourId: c.row.id, mark: pieceMark, state: piece.state } })
    pieces.push({ id: piece.id, mark: pieceMark })
  }
  await mouldFloorRepo.moveState(c.trx, c.actor.workshopId, mould.id, 'cleaning', c.actor.id, true)
  await recordEvent(c.trx, { workshopId: c.actor.workshopId, entity: 'mould', entityId: mould.id, type: 'mould.state_changed', actorId: c.actor.id, at: c.at, backdated: c.backdated, data: { from: mould.state, to: 'cleaning', pull: mould.pulls + 1, pourId: c.row.id } })
  // every pour here was gauged with the floor's default mixing minutes (pourTiming)
  const pours = await poursRepo.calibrationPours(c.trx, c.actor.workshopId, c.row.grade_id)
  const cal = calibrationFromPours(pours.map(p => ({ ...p, mixMinutes: POUR_MIX_MINUTES_DEFAULT })))
  await gradeCalibrationRepo.set(c.trx, c.actor.workshopId, c.row.grade_id, cal.factor, cal.count, cal.excluded)
  return pieces
}

const floorSteps: StepMachine<PourStepRow, FloorActionInput, MadePiece, FloorActionResult> = {
  entity: 'pour',
  noun: 'Pour',
  lock: (trx, workshopId, id) => poursRepo.forStep(trx, workshopId, id),
  refuseState: (row, input) => {
    const from = FLOOR_STEPS[input.kind].from
    return row.state === from ? null : `This pour is already ${row.state}: it cannot be marked ${input.kind.replace('_', ' ')} (that needs ${from})`
  },
  changed: () => 'This pour was changed by someone else; reload to see it',
  previousAt: (_trx, _workshopId, row, input) => (input.kind === 'poured' ? row.mixing_at : input.kind === 'demoulded' ? row.poured_at : null),
  steps: { start_mixing: startMixing, poured, demoulded },
  async answer(trx, actor, pourId, piece) {
    const [card] = await floorCards(trx, actor.workshopId, [pourId])
    return {
      // `piece` is the first of the pour's pieces (one per cavity), `pieces` all of them
      result: { card: card!, piece: piece?.[0] ?? null, pieces: piece ?? [] },
      after: () => {
        emitToWorkshop(actor.workshopId, { type: 'pour.updated', id: pourId, version: card!.pour.version, row: card!.pour })
        for (const p of piece ?? []) emitToWorkshop(actor.workshopId, { type: 'piece.created', id: p.id, row: { ...p, pourId } })
      },
    }
  },
}

/** POST /api/pours/:id/actions: one step of a pour, exactly once per actionId. */
export function pourAction(actor: Actor, pourId: number, input: FloorActionInput) {
  return runStep(floorSteps, actor, pourId, input)
}
