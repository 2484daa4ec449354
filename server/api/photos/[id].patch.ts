import { updatePhoto } from '../../services/photos'
// Staff change a photo's caption or share it with the job's clients (or stop sharing it).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, photoIdParamSchema)
  const input = await validBody(event, photoPatchSchema)
  return updatePhoto(actor, id, input)
})
