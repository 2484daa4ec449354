import { uploadPhotos } from '../../../../services/photos'
import { withPhotoUpload } from '../../../../utils/photo-upload'
// Staff upload one or more photos of a job (multipart: files, caption, shared, pieceId?, pourId?).
// Each file is checked by its content, turned upright, stripped of metadata and stored as WebP.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, idParamSchema)
  return withPhotoUpload(event, appEnv().PHOTO_MAX_BYTES, async ({ fields, files }) => {
    const input = parseOr422(photoUploadFieldsSchema, fields)
    setResponseStatus(event, 201)
    return uploadPhotos(actor, id, input, files)
  })
})
