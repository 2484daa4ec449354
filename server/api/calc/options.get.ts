// What the mix card offers: the workshop's grades and moulds, its units and usual shop
// temperature (any signed-in staff role).
import { calcRepo } from '../../repos/calc'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const db = useDb()
  const [grades, moulds, workshop] = await Promise.all([
    calcRepo.grades(db, actor.workshopId),
    calcRepo.moulds(db, actor.workshopId),
    calcRepo.workshop(db, actor.workshopId),
  ])
  return {
    units: workshop.units as UnitSystem,
    defaultShopTempC: Number(workshop.default_shop_temp_c),
    grades: grades.map(g => ({
      id: Number(g.id), name: g.name as string, bagKg: Number(g.bag_kg), grade: plasterGradeFromRow(g),
      calibration: g.calibration_factor ? { factor: Number(g.calibration_factor), count: g.calibration_count as number, applied: g.calibration_applied as boolean } : null,
    })),
    moulds: moulds.map(m => ({ id: Number(m.id), code: m.code as string, casts: m.casts as string, cavityLitres: Number(m.cavity_litres), maxDwellMinutes: m.max_dwell_minutes as number, state: m.state as string })),
  }
})
