import { pieceStory } from '../../queries/piece-page'
// The piece page: its pour, weighings, photos, register entries, place in finishing and dispatch.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return pieceStory(actor, id)
})
