import { pieceLabel } from '../../../services/piece-labels'
// A piece's label to print: its facts and the QR code of its page's address with the label's
// token (drawn on the first print, kept until a lead revokes it).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return pieceLabel(actor, id)
})
