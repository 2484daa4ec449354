// The mix card's reads: the workshop's grades in use and moulds not retired (through their
// tables' repos), its display units and usual shop temperature.
import type { Knex } from 'knex'
import { gradesRepo } from '../repos/plaster-grades'
import { mouldsRepo } from '../repos/moulds'
import { workshopsRepo } from '../repos/workshops'
import type { PlasterGrade } from '#shared/utils/plaster-core'
import { gradeCalibrationFromRow } from '#shared/utils/catalogue'
import type { MixOptions } from '#shared/types/mix'
import { mouldCastFromRow, pourLitres } from '#shared/utils/plaster-fibrous'

export async function mixOptions(workshopId: number): Promise<MixOptions> {
  const db = useDb()
  const [grades, moulds, workshop] = await Promise.all([gradesRepo.list(db, workshopId), mouldsRepo.list(db, workshopId), workshopsRepo.get(db, workshopId)])
  if (!workshop) notFound('Workshop')
  return {
    units: workshop.units,
    defaultShopTempC: workshop.default_shop_temp_c,
    // the grades list puts archived ones last, by name: those in use keep their name order
    grades: grades.filter(g => !g.archived_at).map(g => ({
      id: g.id, name: g.name, bagKg: g.bag_kg, grade: plasterGradeFromRow(g),
      calibration: gradeCalibrationFromRow(g),
    })),
    moulds: moulds.filter(m => m.state !== 'retired')
      .map(m => ({
        id: m.id, code: m.code, casts: m.casts, cavityLitres: pourLitres(mouldCastFromRow(m)), maxDwellMinutes: m.max_dwell_minutes, state: m.state,
        cavities: m.cavities, castType: m.cast_type,
      })),
  }
}

/** The grade a mix request names by id, as the plaster model wants it (422 when not the workshop's). */
export async function mixGrade(db: Knex, workshopId: number, id: number): Promise<PlasterGrade> {
  const row = await gradesRepo.byId(db, workshopId, id)
  if (!row) unprocessable([{ field: 'gradeId', message: 'is not one of this workshop\'s grades' }])
  return plasterGradeFromRow(row)
}

/** The slurry of one pour (every cavity, or the fibrous shell) and the dwell of a mould a mix request names by id (422 when not the workshop's). */
export async function mixMould(db: Knex, workshopId: number, id: number): Promise<{ cavityLitres: number; maxDwellMinutes: number }> {
  const row = await mouldsRepo.byId(db, workshopId, id)
  if (!row) unprocessable([{ field: 'mouldId', message: 'is not a mould of this workshop' }])
  return { cavityLitres: pourLitres(mouldCastFromRow(row)), maxDwellMinutes: row.max_dwell_minutes }
}
