// One step machine for the tablets' actions on a row (a pour on the floor, a piece in
// finishing): exactly once per actionId (runOnce), the row locked for the step, its state and
// the version the tablet saw checked, the step applied, its register entry written, and the
// live events sent only after the commit. Floor and finishing actions differ in their steps.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { recordEvent } from '../repos/events'
import { actionTime, runOnce, type ActionOutcome } from './actions'

/** What every stepped row has. */
export interface SteppedRow { id: number; version: number; state: string }

/** A step's input: the tablet's action id, the step, the version it saw and when it happened. */
export interface StepInput { actionId: string; kind: string; version: number; at?: string }

export interface StepContext<Row> { trx: Knex; actor: Actor; row: Row; at: Date; backdated: boolean }

export interface StepMachine<Row extends SteppedRow, Input extends StepInput, Out, Result> {
  /** The register's entity and the action kind's prefix: `pour.poured`, `piece.fettled`. */
  entity: string
  /** The row's name in a 404. */
  noun: string
  /** The row, locked until the transaction ends. */
  lock: (trx: Knex, workshopId: number, id: number) => Promise<Row | undefined>
  /** Why the row's state does not allow this step (a 409), or null when it does. */
  refuseState: (row: Row, input: Input) => string | null
  /** The 409 when the row moved on past the version the tablet saw. */
  changed: (row: Row) => string
  /** The previous step's time, which this one may not be dated before. */
  previousAt: (trx: Knex, workshopId: number, row: Row, input: Input) => Promise<Date | null> | Date | null
  steps: { [K in Input['kind']]: (c: StepContext<Row>, input: Extract<Input, { kind: K }>) => Promise<Out> }
  /** The answer (stored for replays) and the live events to send after commit. */
  answer: (trx: Knex, actor: Actor, id: number, out: Out) => Promise<ActionOutcome<Result>>
}

/** Runs one step of `machine` on row `id`, exactly once per `input.actionId`. */
export function runStep<Row extends SteppedRow, Input extends StepInput, Out, Result>(
  machine: StepMachine<Row, Input, Out, Result>, actor: Actor, id: number, input: Input,
) {
  return runOnce<Result>(actor, input.actionId, { kind: `${machine.entity}.${input.kind}`, entityId: id }, async (trx) => {
    const row = await machine.lock(trx, actor.workshopId, id)
    if (!row) notFound(machine.noun)
    const refusal = machine.refuseState(row, input)
    if (refusal) conflict(refusal, { state: row.state, version: row.version })
    if (row.version !== input.version) conflict(machine.changed(row), { state: row.state, version: row.version })
    const c: StepContext<Row> = { trx, actor, row, ...actionTime(input.at, await machine.previousAt(trx, actor.workshopId, row, input)) }
    const step = machine.steps[input.kind as Input['kind']] as (c: StepContext<Row>, input: Input) => Promise<Out>
    return machine.answer(trx, actor, id, await step(c, input))
  })
}

/**
 * Writes a step: the row's change at the version the step started from (`update` answers false
 * when someone else moved it on: a 409 with `changed`), then its register entry, dated `at`.
 */
export async function writeStep<Row extends SteppedRow>(c: StepContext<Row>, w: {
  update: (trx: Knex, workshopId: number, id: number, version: number) => Promise<boolean>
  changed: string
  entity: string
  type: string
  data: Record<string, unknown>
}) {
  if (!(await w.update(c.trx, c.actor.workshopId, c.row.id, c.row.version))) conflict(w.changed)
  await recordEvent(c.trx, {
    workshopId: c.actor.workshopId, entity: w.entity, entityId: c.row.id, type: w.type, actorId: c.actor.id,
    at: c.at, backdated: c.backdated, data: w.data,
  })
}
