import { jobLabels } from '../../../services/piece-labels'
// A job's labels for an A4 sheet: every piece still in the shop, by mark.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return jobLabels(actor, id)
})
