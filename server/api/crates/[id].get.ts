import { crateLabelView } from '../../services/deliveries'
// A crate's label as printed: job, client, site, contents and weight.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return crateLabelView(actor, id)
})
