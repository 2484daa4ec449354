// The board screen's read (GET /api/board) in ONE query and one round trip: the workshop,
// benches, moulds, shop days, open job items, casters, and the range's pours in their lean
// wire form (shared/types/board.ts BoardPourRow: ids, instants once as epoch ms) with the
// names they refer to as lookup tables. PostgreSQL writes each pour row's JSON, so the server
// maps no pour row. Where a pour stands (missed start, overdue demould…) is worked out
// when the row is expanded (shared/utils/board-lean.ts), against `now`, the server's clock. Measured by tests/bench/board.ts beside the raw SQL.
import type { BoardData } from '#shared/types/board'
import { COUNTED_PIECES } from '../repos/planning'
import { DEPOSIT_RELEASED } from '../repos/payments'
import { workshopLocale } from '#shared/utils/workshop-format'
import { benchOrder } from '#shared/utils/board-axis'

interface BoardContextRow {
  timezone: string
  locale: string
  shift_start: string
  shift_end: string
  shift_breaks: { start: string; end: string }[]
  working_days: number[]
  units: 'metric' | 'imperial'
  default_shop_temp_c: number
  default_humidity_pct: number
  benches: { id: number; name: string; sort_order: number }[]
  moulds: { id: number; code: string; casts: string; bench_id: number | null; bench_name: string | null; state: string; pulls: number; expected_pulls: number | null; cavities: number }[]
  shop_days: { day: string; temp_c: number; humidity_pct: number }[]
  job_items: { id: number; job_id: number; job_code: string; description: string; mould_id: number | null; pieces_needed: number; pieces_planned: number; released: boolean; deposit_waiting: boolean }[]
  deposit_waiting_jobs: number[]
  casters: { id: number; name: string }[]
  lookups: BoardData['lookups']
}

/** The local days from..to (inclusive) in the workshop's zone. */
const DAYS = `tstzrange((:from::date)::timestamp AT TIME ZONE w.timezone, ((:to::date) + 1)::timestamp AT TIME ZONE w.timezone)`
/** An instant as epoch ms, a whole number (from date_part's float8; extract's numeric is slower). */
const MS = (x: string) => `round(date_part('epoch', ${x}) * 1000)::int8`

// rp: the ids the lookup tables need, each once, not the range's pour rows (the statement 5.4 →
// 4.3 ms on the bench's 1,500 pours: four semi-joins hashed 1,500 wide rows each)
const BOARD_CONTEXT_SQL = `WITH w AS (SELECT * FROM workshops WHERE id = :workshopId),
  rp AS (SELECT DISTINCT p.job_item_id, p.grade_id, p.caster_id FROM pours p, w WHERE p.workshop_id = w.id AND p.state <> 'void' AND p.slot && ${DAYS})
SELECT w.timezone, w.locale, w.shift_start, w.shift_end, w.shift_breaks, w.working_days, w.units, w.default_shop_temp_c, w.default_humidity_pct,
  (SELECT coalesce(json_agg(json_build_object('id', b.id, 'name', b.name, 'sort_order', b.sort_order) ORDER BY b.sort_order, b.name), '[]')
     FROM benches b WHERE b.workshop_id = w.id AND b.archived_at IS NULL) AS benches,
  (SELECT coalesce(json_agg(json_build_object('id', m.id, 'code', m.code, 'casts', m.casts, 'bench_id', m.bench_id, 'bench_name', b.name,
       'state', m.state, 'pulls', m.pulls, 'expected_pulls', m.expected_pulls, 'cavities', m.cavities) ORDER BY b.sort_order NULLS LAST, m.code), '[]')
     FROM moulds m LEFT JOIN benches b ON b.id = m.bench_id AND b.workshop_id = w.id
     WHERE m.workshop_id = w.id AND m.state <> 'retired') AS moulds,
  (SELECT coalesce(json_agg(json_build_object('day', s.day, 'temp_c', s.temp_c, 'humidity_pct', s.humidity_pct) ORDER BY s.day), '[]')
     FROM shop_days s WHERE s.workshop_id = w.id AND s.day BETWEEN :from::date AND :to::date) AS shop_days,
  (SELECT coalesce(json_agg(json_build_object('id', i.id, 'job_id', j.id, 'job_code', j.code, 'description', i.description,
       'mould_id', i.mould_id, 'pieces_needed', i.pieces_needed,
       'pieces_planned', ${COUNTED_PIECES},
       'released', NOT j.sample_required OR j.sample_state = 'approved', 'deposit_waiting', NOT ${DEPOSIT_RELEASED('j')}) ORDER BY j.due_on NULLS LAST, j.code, i.sort_order, i.id), '[]')
     FROM job_items i JOIN jobs j ON j.id = i.job_id AND j.workshop_id = w.id
     WHERE i.workshop_id = w.id AND j.state = 'open') AS job_items,
  (SELECT coalesce(json_agg(j.id ORDER BY j.id), '[]') FROM jobs j
     WHERE j.workshop_id = w.id AND j.state IN ('open', 'on_hold') AND NOT ${DEPOSIT_RELEASED('j')}) AS deposit_waiting_jobs,
  (SELECT coalesce(json_agg(json_build_object('id', u.id, 'name', u.name) ORDER BY u.name), '[]')
     FROM users u WHERE u.workshop_id = w.id AND u.role IN ('caster', 'lead') AND u.disabled_at IS NULL) AS casters,
  json_build_object(
    'jobs', (SELECT coalesce(json_object_agg(j.id, j.code), '{}') FROM jobs j WHERE j.workshop_id = w.id
      AND j.id IN (SELECT i.job_id FROM job_items i JOIN rp ON rp.job_item_id = i.id WHERE i.workshop_id = w.id)),
    'items', (SELECT coalesce(json_object_agg(i.id, json_build_object('jobId', i.job_id, 'description', i.description)), '{}') FROM job_items i
      WHERE i.workshop_id = w.id AND i.id IN (SELECT job_item_id FROM rp)),
    'grades', (SELECT coalesce(json_object_agg(g.id, g.name), '{}') FROM plaster_grades g WHERE g.workshop_id = w.id AND g.id IN (SELECT grade_id FROM rp)),
    'people', (SELECT coalesce(json_object_agg(u.id, u.name), '{}') FROM users u WHERE u.workshop_id = w.id AND u.id IN (SELECT caster_id FROM rp)),
    'calibration', (SELECT coalesce(json_object_agg(g.id, json_build_object('factor', g.calibration_applied_factor::float8, 'count', g.calibration_applied_count)), '{}')
      FROM plaster_grades g WHERE g.workshop_id = w.id AND g.calibration_applied AND g.calibration_applied_factor IS NOT NULL AND g.id IN (SELECT grade_id FROM rp))
  ) AS lookups
  FROM w`

/**
 * The range's pours, each row already its JSON text in the wire form's order (BoardPourRow), so
 * the server neither reads 19 fields a row nor writes them out again: the answer is the context
 * serialised once with the pour lines joined in. Measured on the bench's 1,500 pours: the
 * server's CPU for one board answer 14 → 9 ms (a sampling profile over 225 requests), the driver
 * no longer reading 28,500 fields nor JSON.stringify writing them again, and less garbage for
 * the collector. Numbers go out as float8 text, the shortest form that reads back the same
 * (PostgreSQL 12 and later), so the answer reads back to the values it carried before; the
 * state goes through to_json, which escapes. One aggregate of the whole array in PostgreSQL was slower
 * (13–15 ms) and so were JSON objects (19 ms). Keep the columns in BoardPourRow's order.
 */
const NULLABLE = (x: string) => `coalesce(${x}::text, 'null')`
const BOARD_POURS_SQL = `SELECT '[' || concat_ws(',', p.id, p.version, p.mould_id, ${NULLABLE('p.job_item_id')}, ${NULLABLE('p.caster_id')}, p.grade_id,
    ${NULLABLE('p.lot_id')}, to_json(p.state), CASE WHEN p.is_sample THEN 'true' ELSE 'false' END, p.consistency::float8, p.set_factor::float8,
    ${MS('lower(p.slot)')}, ${MS('upper(p.slot)')}, ${MS('p.mix_at')}, ${MS('p.demould_open_at')}, ${MS('p.demould_close_at')},
    p.plaster_kg_planned::float8, p.water_kg_planned::float8, p.warnings) || ']'
  FROM pours p JOIN workshops w ON w.id = p.workshop_id
  WHERE p.workshop_id = :workshopId AND p.state <> 'void' AND p.slot && ${DAYS}
  ORDER BY lower(p.slot), p.id`

/**
 * The board for the local days from..to as its JSON text (BoardData; the route sends it with
 * jsonText); 404 when the workshop is gone.
 */
export async function boardJson(workshopId: number, from: string, to: string): Promise<string> {
  const db = useDb()
  const args = { workshopId, from, to }
  // named, so each connection plans them once: planning the context statement (its many
  // subqueries) took longer than running it, 18 ms against 15
  const [context, pours] = await Promise.all([
    db.raw(BOARD_CONTEXT_SQL, args).options({ name: 'board-context' }),
    db.raw(BOARD_POURS_SQL, args).options({ name: 'board-pours', rowMode: 'array' }),
  ])
  const ctx: BoardContextRow | undefined = context.rows[0]
  if (!ctx) notFound('Workshop')
  const rest: Omit<BoardData, 'pours'> = {
    now: Date.now(),
    workshop: {
      timezone: ctx.timezone, locale: workshopLocale(ctx.locale), shiftStart: ctx.shift_start.slice(0, 5), shiftEnd: ctx.shift_end.slice(0, 5),
      shiftBreaks: ctx.shift_breaks, workingDays: ctx.working_days.map(Number), units: ctx.units, defaultShopTempC: Number(ctx.default_shop_temp_c),
      defaultHumidityPct: Number(ctx.default_humidity_pct),
    },
    benches: ctx.benches.map(b => ({ id: Number(b.id), name: b.name, sortOrder: b.sort_order })),
    // in the calendar's row order, so the server's sketch and the first screen need not sort
    moulds: benchOrder(ctx.moulds.map(m => ({
      id: Number(m.id), code: m.code, casts: m.casts, benchId: m.bench_id === null ? null : Number(m.bench_id), benchName: m.bench_name,
      state: m.state, pulls: m.pulls, expectedPulls: m.expected_pulls, lifeFlag: mouldLifeFlag(m.pulls, m.expected_pulls), cavities: Number(m.cavities ?? 1),
    }))),
    lookups: ctx.lookups,
    shopDays: ctx.shop_days.map(s => ({ day: s.day, tempC: Number(s.temp_c), humidityPct: Number(s.humidity_pct) })),
    jobItems: ctx.job_items.map(i => ({
      id: Number(i.id), jobId: Number(i.job_id), jobCode: i.job_code, description: i.description,
      mouldId: i.mould_id === null ? null : Number(i.mould_id), piecesNeeded: i.pieces_needed, piecesPlanned: Number(i.pieces_planned), released: i.released, depositWaiting: i.deposit_waiting,
    })),
    casters: ctx.casters.map(c => ({ id: Number(c.id), name: c.name })),
    depositWaitingJobs: ctx.deposit_waiting_jobs.map(Number),
  }
  // each pour row is one JSON array in BoardPourRow's order (BOARD_POURS_SQL)
  const lines = (pours.rows as [string][]).map(r => r[0]).join(',')
  return `${JSON.stringify(rest).slice(0, -1)},"pours":[${lines}]}`
}
