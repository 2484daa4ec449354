import { markSample } from '../../../services/sample'
// The lead marks the sample to be cast, or ready for the client's approval (mails the client members).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, sampleMarkSchema)
  return markSample(actor, id, input)
})
