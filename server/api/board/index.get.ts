// The pour board for a range of local days (staff): the workshop's calendar, benches, moulds,
// the non-void pours overlapping the range, shop days, open job items and casters.
import { boardRepo } from '../../repos/board'
import { poursRepo } from '../../repos/pours'
import { pourDto } from '../../services/pours'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { from, to } = validQuery(event, boardRangeSchema)
  const db = useDb()
  const [ctx, pours] = await Promise.all([
    boardRepo.context(db, actor.workshopId, from, to),
    poursRepo.inDays(db, actor.workshopId, from, to),
  ])
  if (!ctx) notFound('Workshop')
  const now = new Date()
  return {
    workshop: {
      timezone: ctx.timezone, shiftStart: ctx.shift_start.slice(0, 5), shiftEnd: ctx.shift_end.slice(0, 5),
      workingDays: ctx.working_days.map(Number), units: ctx.units, defaultShopTempC: Number(ctx.default_shop_temp_c),
    },
    benches: ctx.benches.map(b => ({ id: Number(b.id), name: b.name, sortOrder: b.sort_order })),
    moulds: ctx.moulds.map(m => ({
      id: Number(m.id), code: m.code, casts: m.casts, benchId: m.bench_id === null ? null : Number(m.bench_id), benchName: m.bench_name,
      state: m.state, pulls: m.pulls, expectedPulls: m.expected_pulls, lifeFlag: mouldLifeFlag(m.pulls, m.expected_pulls),
    })),
    pours: pours.map(p => pourDto(p, now)),
    shopDays: ctx.shop_days.map(s => ({ day: s.day, tempC: Number(s.temp_c), humidityPct: Number(s.humidity_pct) })),
    jobItems: ctx.job_items.map(i => ({
      id: Number(i.id), jobId: Number(i.job_id), jobCode: i.job_code, description: i.description,
      mouldId: i.mould_id === null ? null : Number(i.mould_id), piecesNeeded: i.pieces_needed, piecesPlanned: Number(i.pieces_planned), released: i.released,
    })),
    casters: ctx.casters.map(c => ({ id: Number(c.id), name: c.name })),
  }
})
