// The mix card's numbers for other tools (any signed-in role): batch, slurry temperature,
// demould window, cast, strength, heat and the set curve, from the shared plaster model.
import { calcRepo } from '../../repos/calc'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...EVERYONE)
  const input = await validBody(event, mixRequestSchema)
  const db = useDb()
  let grade = input.grade
  if (input.gradeId) {
    const row = await calcRepo.grade(db, actor.workshopId, input.gradeId)
    if (!row) unprocessable([{ field: 'gradeId', message: 'is not a plaster grade of this workshop' }])
    grade = plasterGradeFromRow(row)
  }
  let cavityLitres = input.cavityLitres
  let maxDwellMinutes = input.maxDwellMinutes
  if (input.mouldId) {
    const mould = await calcRepo.mould(db, actor.workshopId, input.mouldId)
    if (!mould) unprocessable([{ field: 'mouldId', message: 'is not a mould of this workshop' }])
    cavityLitres ??= Number(mould.cavity_litres)
    maxDwellMinutes ??= mould.max_dwell_minutes
  }
  try {
    return mixSummary({ ...input, grade: grade!, cavityLitres: cavityLitres!, maxDwellMinutes: maxDwellMinutes ?? 240 })
  }
  catch (e) {
    if (e instanceof PlasterInputError) unprocessable([{ field: e.field, message: e.message }])
    throw e
  }
})
