// Saves the workshop's settings (lead); 409 when another lead saved first.
import { workshopsRepo, workshopDto } from '../../repos/workshops'
import { timezonesRepo } from '../../repos/timezones'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const s = await validBody(event, workshopSettingsSchema)
  const db = useDb()
  // Intl accepted the zone (the schema); the database must know it too (server/repos/timezones.ts)
  const timezone = await timezonesRepo.canonical(db, s.timezone)
  if (!timezone) unprocessable([{ field: 'timezone', message: `Timezone ${s.timezone} is not one the database knows: choose a zone such as Europe/London` }])
  const row = await workshopsRepo.update(db, actor.workshopId, s.version, {
    name: s.name, units: s.units, timezone, shift_start: s.shiftStart, shift_end: s.shiftEnd, shift_breaks: s.shiftBreaks,
    working_days: [...new Set(s.workingDays)].sort(), default_shop_temp_c: s.defaultShopTempC, default_humidity_pct: s.defaultHumidityPct,
    ...(s.locale ? { locale: s.locale } : {}),
    ...(s.crateMaxKg !== undefined ? { crate_max_kg: s.crateMaxKg } : {}),
  })
  if (!row) conflict('The settings were changed by someone else; reload to see them')
  const dto = workshopDto(row)
  emitToWorkshop(actor.workshopId, { type: 'workshop.updated', id: actor.workshopId, version: dto.version, row: dto })
  return dto
})
