// The lead's Today (GET /api/overview): what needs the lead now, each line with the page where
// it is dealt with. One round trip: every kind of line is a json subselect of one query on the
// workshop row, all scoped to the workshop.
//
// The rules, in the order Today lists them:
// - missed start: a planned pour whose prep start has passed (last 14 days; older ones are the
//   register's business) → the board on that day;
// - demould overdue: a mixing or setting pour past its demould window's close (the same rule
//   as pourOverdue in shared/utils/board-rules.ts) → the board on that day;
// - job projected late: an open job with a due date whose last planned pour's demould opens
//   after that date (projected from the board, with the date), or that has pieces not yet on
//   the board and is due within 14 days → the job;
// - lots: past their use-by, or with less than two bags' worth left (common practice: order
//   before the last two bags so a job never waits on plaster) → the lots page;
// - moulds: at MOULD_LIFE_FLAG_FRACTION of their expected pulls, or waiting for repair → the mould;
// - finishing: pieces to fettle, waiting repair, or past their dry-by time → the finishing queue;
// - samples: changes requested by the client (the lead acts) or waiting for the client's
//   decision → the job;
// - mail: mail that failed or is being retried → the captured mail page.
import type { TodayLine, TodayOverview } from '#shared/types/board'
import { MOULD_LIFE_FLAG_FRACTION } from '#shared/utils/board-rules'
import { formatUnits, type UnitSystem } from '#shared/utils/units-display'
import { dayIn, formatDateTime, formatDay, formatTime, workshopLocale } from '#shared/utils/workshop-format'

const LOOKBACK_DAYS = 14
const DUE_SOON_DAYS = 14
const SHORT_BAGS = 2

const SQL = `SELECT w.name, w.timezone, w.units, w.locale, now() AS now,
  (SELECT coalesce(json_agg(x ORDER BY x.start), '[]') FROM (
     SELECT p.id, lower(p.slot) AS start, m.code AS mould, j.code AS job, (lower(p.slot) AT TIME ZONE w.timezone)::date::text AS day
       FROM pours p JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = w.id
       LEFT JOIN job_items i ON i.id = p.job_item_id AND i.workshop_id = w.id LEFT JOIN jobs j ON j.id = i.job_id AND j.workshop_id = w.id
      WHERE p.workshop_id = w.id AND p.state = 'planned' AND lower(p.slot) < now() AND lower(p.slot) > now() - make_interval(days => :lookback::int)
      LIMIT 50) x) AS missed,
  (SELECT coalesce(json_agg(x ORDER BY x.close), '[]') FROM (
     SELECT p.id, p.demould_close_at AS close, m.code AS mould, j.code AS job, (p.demould_close_at AT TIME ZONE w.timezone)::date::text AS day
       FROM pours p JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = w.id
       LEFT JOIN job_items i ON i.id = p.job_item_id AND i.workshop_id = w.id LEFT JOIN jobs j ON j.id = i.job_id AND j.workshop_id = w.id
      WHERE p.workshop_id = w.id AND p.state IN ('mixing', 'setting') AND p.demould_close_at < now()
      LIMIT 50) x) AS overdue,
  (SELECT coalesce(json_agg(x ORDER BY x.due_on), '[]') FROM (
     SELECT j.id, j.code, j.due_on::text AS due_on,
       (SELECT max((p.demould_open_at AT TIME ZONE w.timezone)::date)::text FROM pours p JOIN job_items i ON i.id = p.job_item_id
         WHERE p.workshop_id = w.id AND i.job_id = j.id AND p.state <> 'void') AS projected,
       (SELECT coalesce(sum(greatest(i.pieces_needed - (SELECT count(*) FROM pours p WHERE p.workshop_id = w.id AND p.job_item_id = i.id AND p.state <> 'void'), 0)), 0)
          FROM job_items i WHERE i.workshop_id = w.id AND i.job_id = j.id) AS unplanned
       FROM jobs j WHERE j.workshop_id = w.id AND j.state = 'open' AND j.due_on IS NOT NULL) x
     WHERE x.projected > x.due_on OR (x.unplanned > 0 AND x.due_on::date <= (now() AT TIME ZONE w.timezone)::date + :dueSoon::int)) AS late,
  (SELECT coalesce(json_agg(x ORDER BY x.code), '[]') FROM (
     SELECT l.id, l.lot_code AS code, l.use_by::text AS use_by, l.bag_kg,
       l.bags_received * l.bag_kg - coalesce((SELECT sum(coalesce(p.plaster_kg_actual, p.plaster_kg_planned)) FROM pours p
         WHERE p.workshop_id = w.id AND p.lot_id = l.id AND p.state <> 'void'), 0) AS left_kg
       FROM plaster_lots l WHERE l.workshop_id = w.id AND l.archived_at IS NULL) x
     WHERE x.use_by < (now() AT TIME ZONE w.timezone)::date::text OR x.left_kg < :shortBags::int * x.bag_kg) AS lots,
  (SELECT coalesce(json_agg(json_build_object('id', m.id, 'code', m.code, 'state', m.state, 'pulls', m.pulls, 'expected', m.expected_pulls) ORDER BY m.code), '[]')
     FROM moulds m WHERE m.workshop_id = w.id AND m.state <> 'retired'
      AND (m.state = 'repair' OR (m.expected_pulls IS NOT NULL AND m.pulls >= :lifeFraction::numeric * m.expected_pulls))) AS moulds,
  (SELECT json_build_object(
     'to_fettle', count(*) FILTER (WHERE pc.state = 'to_fettle'),
     'repair', count(*) FILTER (WHERE pc.state = 'repair'),
     'dry', count(*) FILTER (WHERE pc.state = 'drying' AND pc.dry_by <= now()))
     FROM pieces pc WHERE pc.workshop_id = w.id) AS pieces,
  (SELECT coalesce(json_agg(json_build_object('id', j.id, 'code', j.code, 'state', j.sample_state) ORDER BY j.sample_state DESC, j.code), '[]')
     FROM jobs j WHERE j.workshop_id = w.id AND j.state IN ('open', 'on_hold') AND j.sample_state IN ('changes_requested', 'awaiting_approval')) AS samples,
  (SELECT json_build_object('failed', count(*) FILTER (WHERE o.status = 'failed'), 'retrying', count(*) FILTER (WHERE o.status = 'queued' AND o.attempts > 0))
     FROM mail_outbox o WHERE o.workshop_id = w.id) AS mail,
  (SELECT coalesce(json_object_agg(s.state, s.n), '{}') FROM (SELECT p.state, count(*) AS n FROM pours p
     WHERE p.workshop_id = w.id AND p.state <> 'void' AND (lower(p.slot) AT TIME ZONE w.timezone)::date = (now() AT TIME ZONE w.timezone)::date
     GROUP BY p.state) s) AS today
  FROM workshops w WHERE w.id = :workshopId`

interface OverviewRow {
  name: string
  timezone: string
  units: UnitSystem
  locale: string
  now: Date
  missed: { id: number; start: string; mould: string; job: string | null; day: string }[]
  overdue: { id: number; close: string; mould: string; job: string | null; day: string }[]
  late: { id: number; code: string; due_on: string; projected: string | null; unplanned: number }[]
  lots: { id: number; code: string; use_by: string | null; bag_kg: number; left_kg: number }[]
  moulds: { id: number; code: string; state: string; pulls: number; expected: number | null }[]
  pieces: { to_fettle: number; repair: number; dry: number }
  samples: { id: number; code: string; state: string }[]
  mail: { failed: number; retrying: number }
  today: Record<string, number>
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`

/**
 * The Today lines, in the order above, written in the workshop's house style
 * (shared/utils/workshop-format.ts: its zone and locale; a time alone when it falls today) and
 * its units.
 */
export async function overviewToday(workshopId: number, db = useDb()): Promise<TodayOverview> {
  const r: OverviewRow | undefined = (await db.raw(SQL, {
    workshopId, lookback: LOOKBACK_DAYS, dueSoon: DUE_SOON_DAYS, shortBags: SHORT_BAGS, lifeFraction: MOULD_LIFE_FLAG_FRACTION,
  })).rows[0]
  if (!r) notFound('Workshop')
  const locale = workshopLocale(r.locale)
  const today = dayIn(r.now, r.timezone)
  const when = (iso: string) => dayIn(iso, r.timezone) === today ? formatTime(iso, r.timezone, locale) : formatDateTime(iso, r.timezone, locale)
  const day = (d: string) => formatDay(d, r.timezone, locale)
  const board = (day: string) => `/lead/board?view=day&date=${day}`
  const lines: TodayLine[] = [
    ...r.missed.map(p => ({ kind: 'missed-start' as const, at: new Date(p.start).toISOString(), to: board(p.day),
      text: `${p.job ?? 'A pour'} on ${p.mould} missed its start at ${when(p.start)}: cast it or move it` })),
    ...r.overdue.map(p => ({ kind: 'demould-overdue' as const, at: new Date(p.close).toISOString(), to: board(p.day),
      text: `${p.job ?? 'A pour'} on ${p.mould}: demould overdue since ${when(p.close)}` })),
    ...r.late.map(j => ({ kind: 'job-late' as const, at: j.projected ?? j.due_on, to: `/lead/jobs/${j.id}`,
      text: j.projected && j.projected > j.due_on
        ? `${j.code} projected late: due ${day(j.due_on)}, last demould on the board ${day(j.projected)}`
        : `${j.code} due ${day(j.due_on)}: ${plural(Number(j.unplanned), 'piece')} not on the board yet` })),
    ...r.lots.map(l => ({ kind: 'lot' as const, at: l.use_by, to: '/lead/lots',
      text: l.use_by && l.use_by < today
        ? `Lot ${l.code} is past its use-by date (${day(l.use_by)})`
        : `Lot ${l.code} is running short: ${formatUnits.mass(Math.max(0, Number(l.left_kg)), r.units, 0)} left` })),
    ...r.moulds.map(m => ({ kind: 'mould' as const, at: null, to: `/lead/moulds/${m.id}`,
      text: m.state === 'repair' ? `Mould ${m.code} is waiting for repair` : `Mould ${m.code} is near the end of its life: ${m.pulls} of ${m.expected} pulls` })),
    ...([['to_fettle', 'to fettle'], ['repair', 'waiting for repair'], ['dry', 'past their dry-by time, to check and mark ready']] as const)
      .filter(([k]) => Number(r.pieces[k]) > 0)
      .map(([k, words]) => ({ kind: 'finishing' as const, at: null, to: '/finishing', text: `${plural(Number(r.pieces[k]), 'piece')} ${words}` })),
    ...r.samples.map(j => ({ kind: 'sample' as const, at: null, to: `/lead/jobs/${j.id}`,
      text: j.state === 'changes_requested' ? `${j.code}: the client asked for changes to the sample` : `${j.code}: sample waiting for the client's decision` })),
    ...(Number(r.mail.failed) || Number(r.mail.retrying)
      ? [{ kind: 'mail' as const, at: null, to: '/lead/mails', text: `Mail waiting: ${Number(r.mail.failed)} failed, ${Number(r.mail.retrying)} being retried` }]
      : []),
  ]
  return {
    workshop: r.name, timezone: r.timezone, now: new Date(r.now).toISOString(), lines,
    poursTodayByState: Object.fromEntries(Object.entries(r.today).map(([k, v]) => [k, Number(v)])),
  }
}
