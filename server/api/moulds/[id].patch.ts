import { saveMould } from '../../services/catalogue'
// Edit a mould's details (lead); its state changes through POST /api/moulds/:id/state.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, mouldPatchSchema)
  return saveMould(actor, { id, version }, input)
})
