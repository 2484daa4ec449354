import { uploadPhotos } from '../../../../services/photos'
import { readPhotoUpload } from '../../../../utils/photo-upload'
// Staff upload one or more photos of a job (multipart: files, caption, shared, pieceId?, pourId?).
// Each file is checked by its content, turned upright, stripped of metadata and stored as WebP.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, idParamSchema)
  const { fields, files } = await readPhotoUpload(event, appEnv().PHOTO_MAX_BYTES)
  const input = parseOr422(photoUploadFieldsSchema, fields)
  setResponseStatus(event, 201)
  return uploadPhotos(actor, id, input, files)
})
