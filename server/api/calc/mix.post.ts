// The mix card's numbers for other tools (any signed-in role): batch, slurry temperature,
// demould window, cast, strength, heat and the set curve, from the shared plaster model.
import { mixGrade, mixMould } from '../../services/calc'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...EVERYONE)
  const input = await validBody(event, mixRequestSchema)
  const db = useDb()
  let grade = input.grade
  if (input.gradeId) grade = await mixGrade(db, actor.workshopId, input.gradeId)
  let cavityLitres = input.cavityLitres
  let maxDwellMinutes = input.maxDwellMinutes
  if (input.mouldId) {
    const mould = await mixMould(db, actor.workshopId, input.mouldId)
    cavityLitres ??= mould.cavityLitres
    maxDwellMinutes ??= mould.maxDwellMinutes
  }
  // a PlasterInputError becomes a 422 naming the field in the error handler (asHttpError)
  return mixSummary({ ...input, grade: grade!, cavityLitres: cavityLitres!, maxDwellMinutes: maxDwellMinutes ?? 240 })
})
