// The finisher's piece actions: fettled → drying (with a dry-by time), weighed, ready, packed,
// and repair, repaired, rejected; each exactly once (services/step-machine.ts) in one transaction
// with its register entry. The server judges the order of steps and the version the tablet saw.
//
// The steps are FINISHING_STEPS (shared/utils/finishing-schemas.ts); every piece action, a
// weighing included, moves the piece's version on. Ready needs constant weight in the current
// drying spell (`constantWeight`: two weighings at least a day apart within 0.1 %, at least 2 g,
// plaster-drying.ts), or a lead's `override`, kept in the register; the free water against the
// computed dry mass is shown as a guide only (the model's dry mass is good to about 2 %). The
// dry-by date at fettling uses the shop's own falling-rate factor once enough of its pieces were
// weighed to constant weight (finishingFallingRate), and says which factor it used. A
// rejected piece's pour stops counting for the planner, the board and the client's counts
// (COUNTED_POUR in server/repos/planning.ts), so its item is planned again. The `ready` step
// mails the job's client when every item of the open job has its pieces ready, packed or
// dispatched (notifyJobReady). Only packed pieces go on a dispatch note (services/dispatches.ts).
//
// Fettling and repair are timed for the job's cost (shared/utils/job-cost.ts): fettle_start /
// fettle_stop on a piece to fettle, repair_start / repair_stop on a piece in repair; fettled,
// repaired and rejected stop the clock too. A stop needs a running clock of that work (409); a
// start while someone else's clock runs takes the piece over, the finisher's own is refused.
import type { Actor } from '../utils/auth'
import type { FinishingActionResult } from '#shared/types/finishing'
import type { FinishingActionInput } from '#shared/utils/finishing-schemas'
import { FINISHING_STEPS, FINISHING_TIMER_STEPS, type FinishingPieceState, type FinishingTimerKind } from '#shared/utils/finishing-steps'
import { dryness } from '#shared/utils/plaster-drying'
import { finishingDryBy } from '#shared/utils/finishing'
import { piecesRepo, type PieceRow } from '../repos/pieces'
import { runStep, writeStep, type StepContext as Step, type StepMachine } from './step-machine'
import { loadWorkshop } from './workshop'
import { dryingRoom, pieceDtos, shopFallingRate } from '../queries/finishing-queue'
import { notifyJobReady } from './notify'

type StepContext = Step<PieceRow>
type StepOutcome = Partial<Pick<FinishingActionResult, 'dryness' | 'drying' | 'jobReady'>>

const STATE_WORDS: Record<FinishingPieceState, string> = {
  to_fettle: 'waiting to be fettled', repair: 'in repair', drying: 'drying', ready: 'ready', packed: 'packed', dispatched: 'dispatched', rejected: 'rejected',
}
const or = (states: readonly string[]) => states.map(s => STATE_WORDS[s as FinishingPieceState]).join(' or ')

function write(c: StepContext, kind: FinishingActionInput['kind'], patch: Record<string, unknown>, data: Record<string, unknown>) {
  const to = FINISHING_STEPS[kind].to
  return writeStep(c, {
    update: (trx, workshopId, id, version) => piecesRepo.step(trx, workshopId, id, version, { state: to, ...patch }),
    changed: `Piece ${c.row.mark} was changed by someone else; reload to see it`,
    entity: 'piece', type: `piece.${kind}`, data: { from: c.row.state, to, mark: c.row.mark, ...data },
  })
}

async function fettled(c: StepContext, input: Extract<FinishingActionInput, { kind: 'fettled' }>): Promise<StepOutcome> {
  const ws = await loadWorkshop(c.trx, c.actor.workshopId)
  const room = await dryingRoom(c.trx, ws, c.at)
  const airTempC = input.dryingTempC ?? room.tempC
  const relHumidityPct = input.dryingHumidityPct ?? room.humidityPct
  const { cavityLitres, thicknessMm } = await piecesRepo.dryingSection(c.trx, c.actor.workshopId, c.row.pour_id)
  const fallingRate = await shopFallingRate(c.trx, c.actor.workshopId)
  const est = finishingDryBy({
    from: c.at, wetMassKg: Number(c.row.wet_mass_kg), dryMassKg: Number(c.row.dry_mass_kg), cavityLitres, airTempC, relHumidityPct, thicknessMm, fallingRateFactor: fallingRate.factor,
  })
  const hours = Number.isFinite(est.hours) ? est.hours : null
  const baseHours = hours === null ? null : hours / fallingRate.factor
  await write(c, 'fettled', { dry_by: est.dryBy, drying_temp_c: airTempC, drying_humidity_pct: relHumidityPct, reason: null },
    { dryingTempC: airTempC, dryingHumidityPct: relHumidityPct, roomFrom: input.dryingTempC === undefined ? room.source : 'form', hours, baseHours, fallingRate: { factor: fallingRate.factor, count: fallingRate.count, source: fallingRate.source }, dryBy: est.dryBy, warnings: est.warnings })
  return { drying: { hours, dryBy: est.dryBy?.toISOString() ?? null, warnings: est.warnings, fallingRate } }
}

async function weighed(c: StepContext, input: Extract<FinishingActionInput, { kind: 'weighed' }>): Promise<StepOutcome> {
  const d = dryness({ weighedKg: input.weighedKg, dryMassKg: Number(c.row.dry_mass_kg) })
  await piecesRepo.addWeighing(c.trx, c.actor.workshopId, { pieceId: c.row.id, kg: input.weighedKg, at: c.at, by: c.actor.id })
  // constant weight over the spell's weighings, this one included
  const [view] = await pieceDtos(c.trx, c.actor.workshopId, [c.row.id])
  const cw = view!.constantWeight
  await write(c, 'weighed', {}, { weighedKg: input.weighedKg, freeWaterKg: d.freeWaterKg, freeWaterPct: d.freeWaterPct, constantWeight: cw.isDry, changePct: cw.changePct, hoursApart: cw.hoursApart })
  return { dryness: { freeWaterKg: d.freeWaterKg, freeWaterPct: d.freeWaterPct, warnings: d.warnings, constantWeight: cw } }
}

/**
 * Ready needs the trade's proof: constant weight over this drying spell's weighings (two at
 * least a day apart within 0.1 %, at least 2 g; plaster-drying.ts `constantWeight`). Without
 * it, 409 says what is missing (no weighing, no second weighing a day later, still changing).
 * A lead may pass a piece anyway (`override`: the lead has judged it dry another way); the
 * register keeps that it was overridden.
 */
async function ready(c: StepContext, input: Extract<FinishingActionInput, { kind: 'ready' }>): Promise<StepOutcome> {
  if (input.override && c.actor.role !== 'lead') {
    throw createError({ statusCode: 403, message: 'Only a lead can pass a piece as dry without constant weight' })
  }
  const [view] = await pieceDtos(c.trx, c.actor.workshopId, [c.row.id])
  const last = view?.lastWeighing ?? null
  const cw = view!.constantWeight
  if (!input.override && !cw.isDry) {
    conflict(`Piece ${c.row.mark} is not shown dry yet: ${cw.message} Ready needs constant weight, or a lead to pass it.`, { state: c.row.state, version: c.row.version, lastWeighing: last, constantWeight: cw })
  }
  await write(c, 'ready', {}, { override: !!input.override, lastWeighing: last, constantWeight: cw })
  return { jobReady: await checkJobReady(c) }
}

/**
 * When this piece completes its job (piecesRepo.jobReady: every item has its needed pieces
 * ready, packed or dispatched), the job's client members hear of it, inside this transaction.
 * The job row is locked first, so two pieces readied at once on two tablets cannot both miss it.
 */
async function checkJobReady(c: StepContext) {
  const jobId = await piecesRepo.jobIdOfItem(c.trx, c.actor.workshopId, c.row.job_item_id)
  if (!jobId) return false
  await piecesRepo.lockJob(c.trx, c.actor.workshopId, jobId)
  if (!(await piecesRepo.jobReady(c.trx, c.actor.workshopId, jobId))) return false
  await notifyJobReady(c.trx, c.actor.workshopId, jobId)
  return true
}

async function repair(c: StepContext, input: Extract<FinishingActionInput, { kind: 'repair' }>): Promise<StepOutcome> {
  // back to the bench: the drying estimate no longer holds
  await write(c, 'repair', { reason: input.reason, dry_by: null }, { reason: input.reason })
  return {}
}

async function repaired(c: StepContext, input: Extract<FinishingActionInput, { kind: 'repaired' }>): Promise<StepOutcome> {
  await write(c, 'repaired', {}, { notes: input.notes ?? null })
  return {}
}

/**
 * A rejected piece leaves the count: the planner's "pieces still to plan" and the client's
 * planned and cast counts no longer include its pour (server/repos/planning.ts), so the item
 * goes back on the planner for one more cast.
 */
async function rejected(c: StepContext, input: Extract<FinishingActionInput, { kind: 'rejected' }>): Promise<StepOutcome> {
  await write(c, 'rejected', { reason: input.reason, dry_by: null }, { reason: input.reason, pourId: c.row.pour_id })
  return {}
}

async function packed(c: StepContext): Promise<StepOutcome> {
  await write(c, 'packed', {}, {})
  return {}
}

const WORK_WORDS = { fettle: 'Fettling', repair: 'Repair' } as const

async function timerStep(c: StepContext, kind: FinishingTimerKind): Promise<StepOutcome> {
  const { work, start } = FINISHING_TIMER_STEPS[kind]
  const running = await piecesRepo.runningTimer(c.trx, c.actor.workshopId, c.row.id)
  if (start && running?.work === work && running.by === c.actor.id) {
    conflict(`${WORK_WORDS[work]} of piece ${c.row.mark} is already being timed by you`, { state: c.row.state, version: c.row.version })
  }
  if (!start && running?.work !== work) {
    conflict(`${WORK_WORDS[work]} of piece ${c.row.mark} is not being timed: start it first`, { state: c.row.state, version: c.row.version })
  }
  await write(c, kind, {}, start && running ? { takenOverFrom: running.by } : {})
  return {}
}

const finishingSteps: StepMachine<PieceRow, FinishingActionInput, StepOutcome, FinishingActionResult> = {
  entity: 'piece',
  noun: 'Piece',
  lock: (trx, workshopId, id) => piecesRepo.forUpdate(trx, workshopId, id),
  refuseState: (row, input) => {
    const from = FINISHING_STEPS[input.kind].from
    return from.includes(row.state) ? null : `Piece ${row.mark} is ${STATE_WORDS[row.state]}: it cannot be marked ${input.kind} (that needs a piece ${or(from)})`
  },
  changed: row => `Piece ${row.mark} was changed by someone else; reload to see it`,
  previousAt: (trx, workshopId, row) => piecesRepo.lastEventAt(trx, workshopId, row.id),
  steps: {
    fettled, weighed, ready, repair, repaired, rejected, packed,
    fettle_start: c => timerStep(c, 'fettle_start'),
    fettle_stop: c => timerStep(c, 'fettle_stop'),
    repair_start: c => timerStep(c, 'repair_start'),
    repair_stop: c => timerStep(c, 'repair_stop'),
  },
  async answer(trx, actor, pieceId, out) {
    const [piece] = await pieceDtos(trx, actor.workshopId, [pieceId])
    const jobId = piece!.job?.id ?? null
    return {
      result: { piece: piece!, dryness: out.dryness ?? null, drying: out.drying ?? null, jobReady: out.jobReady ?? false },
      after: () => {
        emitToWorkshop(actor.workshopId, { type: 'piece.updated', id: pieceId, version: piece!.version, row: piece! })
        // the client's progress counts moved: tell the job's room only that, nothing internal
        if (jobId) emitToJob(actor.workshopId, jobId, { type: 'job.progress', id: jobId })
      },
    }
  },
}

/** POST /api/pieces/:id/actions: one finishing step of a piece, exactly once per actionId. */
export function pieceAction(actor: Actor, pieceId: number, input: FinishingActionInput) {
  return runStep(finishingSteps, actor, pieceId, input)
}
