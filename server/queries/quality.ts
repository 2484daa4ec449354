// The quality screen's read: the demoulded pours of a period and their figures (shared/utils/quality.ts).
import type { QualityReportDto } from '#shared/types/quality'
import type { Knex } from 'knex'
import type { QualityPour } from '#shared/utils/quality'

/** Demoulded pours with a result whose local mixing day lies in from..to. */
async function demouldedPours(db: Knex, workshopId: number, from: string, to: string): Promise<QualityPour[]> {
  const day = '(coalesce(p.mixing_at, p.mix_at) AT TIME ZONE w.timezone)::date'
  const rows: { mould: string; grade: string; caster: string | null; shop_temp_c: string | null; result: 'sound' | 'defect'; mixing_at: Date | null; demould_open_at: Date; demould_close_at: Date | null; demoulded_at: Date | null; predicted_demould_minutes: string | number | null }[] = await db('pours as p')
    .join('workshops as w', 'w.id', 'p.workshop_id')
    .join('moulds as m', function () {
      this.on('m.id', 'p.mould_id').andOn('m.workshop_id', 'p.workshop_id')
    })
    .join('plaster_grades as g', function () {
      this.on('g.id', 'p.grade_id').andOn('g.workshop_id', 'p.workshop_id')
    })
    .leftJoin('users as u', function () {
      this.on('u.id', 'p.caster_id').andOn('u.workshop_id', 'p.workshop_id')
    })
    .where({ 'p.workshop_id': workshopId, 'p.state': 'demoulded' }).whereNotNull('p.result')
    .whereRaw(`${day} BETWEEN ?::date AND ?::date`, [from, to])
    .select('m.code as mould', 'g.name as grade', 'u.name as caster', 'p.shop_temp_c', 'p.result', 'p.mixing_at', 'p.demould_open_at', 'p.demould_close_at', 'p.demoulded_at', 'p.predicted_demould_minutes')
  return rows.map(r => ({
    mould: r.mould, grade: r.grade, caster: r.caster, shopTempC: r.shop_temp_c === null ? null : Number(r.shop_temp_c),
    result: r.result, mixingAt: r.mixing_at, demouldOpenAt: r.demould_open_at, demouldCloseAt: r.demould_close_at, demouldedAt: r.demoulded_at,
    predictedMinutes: r.predicted_demould_minutes === null ? null : Number(r.predicted_demould_minutes),
  }))
}

/** GET /api/quality: defect rates and demould calibration over the local days from..to. */
export async function qualityReport(workshopId: number, from: string, to: string): Promise<QualityReportDto> {
  return { from, to, ...qualityFigures(await demouldedPours(useDb(), workshopId, from, to)) }
}
