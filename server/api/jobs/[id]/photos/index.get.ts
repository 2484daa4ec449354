import { listPhotos } from '../../../../services/photos'
// A job's photos for staff, newest first (a client member reads GET /api/client/jobs/:id/photos).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, idParamSchema)
  return listPhotos(actor, id)
})
