import { listPhotos } from '../../../../services/photos'
// A job's photos, newest first: staff see all, a client member only the shared ones.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...EVERYONE)
  const { id } = validParams(event, idParamSchema)
  return listPhotos(actor, id)
})
