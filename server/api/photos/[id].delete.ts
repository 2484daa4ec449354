import { deletePhoto } from '../../services/photos'
// The uploader or a lead deletes a photo; its stored files go with it.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, photoIdParamSchema)
  await deletePhoto(actor, id)
  setResponseStatus(event, 204)
  return null
})
