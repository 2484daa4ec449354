// The board's lean wire form (GET /api/board) and its expansion into the PourDto every board
// component reads. On the wire a pour is one array of values (shared/types/board.ts
// BoardPourRow gives the order) carrying ids only; names come once each from the lookup tables
// (the moulds list; jobs, items, grades and people), and its five instants as epoch ms.
import type { BoardData, BoardPourFields, BoardPourRow, PourDto } from '../types/board'
import { missedStartWarning, pourSituation } from './pour-status'
import { inUnits } from './units-display'

const iso = (ms: number) => new Date(ms).toISOString()

/** A wire row's fields by name. */
export function leanPour(row: BoardPourRow): BoardPourFields {
  const [id, version, mouldId, jobItemId, casterId, gradeId, lotId, state, isSample, consistency, setFactor, t0, t1, t2, t3, t4, plasterKg, waterKg, warnings] = row
  return { id, version, mouldId, jobItemId, casterId, gradeId, lotId, state, isSample, consistency, setFactor, t: [t0, t1, t2, t3, t4], plasterKg, waterKg, warnings }
}

/** One lean row as the PourDto the routes that write pours answer with. */
export function expandPour(data: Pick<BoardData, 'moulds' | 'lookups' | 'now' | 'workshop'>, row: BoardPourRow, names = boardNames(data)): PourDto {
  const p = leanPour(row)
  // each instant written once (a board of 540 pours wrote 4,320 ISO strings on every server
  // render, 4 ms of its time)
  const [slotStart, slotEnd, mixAt, demouldOpenAt, demouldCloseAt] = p.t.map(iso) as [string, string, string, string, string]
  // the one classification (pour-status.ts), as the write routes' pourDto applies it
  const situation = pourSituation({ state: p.state, mixAt, demouldOpenAt, demouldCloseAt }, data.now)
  const item = p.jobItemId === null ? undefined : data.lookups.items[p.jobItemId]
  const jobId = item?.jobId ?? null
  return {
    id: p.id, version: p.version, mouldId: p.mouldId, mouldCode: names.mould.get(p.mouldId) ?? '',
    jobItemId: p.jobItemId, jobId, jobCode: jobId === null ? null : data.lookups.jobs[jobId] ?? null, itemDescription: item?.description ?? null,
    casterId: p.casterId, casterName: p.casterId === null ? null : data.lookups.people[p.casterId] ?? null,
    gradeId: p.gradeId, gradeName: data.lookups.grades[p.gradeId] ?? '', lotId: p.lotId,
    state: p.state, isSample: p.isSample, consistency: p.consistency, setFactor: p.setFactor,
    slotStart, slotEnd, mixAt, demouldOpenAt, demouldCloseAt,
    plasterKg: p.plasterKg, waterKg: p.waterKg, warnings: [...(situation === 'missed_start' ? [missedStartWarning(mixAt, data.workshop.timezone, data.workshop.locale)] : []), ...p.warnings.map(w => inUnits(w, data.workshop.units))],
    overdue: situation === 'overdue_demould', situation,
  }
}

/** The name maps expandPour reads, built once per board. */
export function boardNames(data: Pick<BoardData, 'moulds'>) {
  return { mould: new Map(data.moulds.map(m => [m.id, m.code])) }
}

/** Every pour of the board as a PourDto. */
export function expandBoardPours(data: BoardData): PourDto[] {
  const names = boardNames(data)
  return data.pours.map(p => expandPour(data, p, names))
}
