import { decideSample } from '../../../services/sample'
// A client member approves the sample or asks for changes with a comment; recorded and mailed to the lead.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, sampleDecisionSchema)
  return decideSample(actor, id, input)
})
