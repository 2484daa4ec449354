import { listClientPhotos } from '../../../../services/photos'
// A client member's job's shared photos, newest first, without who took them or what they show;
// anyone else's job is a 404.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  return listClientPhotos(actor, id)
})
