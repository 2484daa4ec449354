import { photoFile } from '../../../services/photos'
// One stored variant (thumb or display) as WebP, only to someone who may see the photo; any
// other request gets the same 404 as a photo that does not exist. Private: never in a shared cache.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...EVERYONE)
  const { id, variant } = validParams(event, photoVariantParamsSchema)
  const data = await photoFile(actor, id, variant)
  setResponseHeaders(event, { 'content-type': 'image/webp', 'cache-control': 'private, max-age=86400', 'x-content-type-options': 'nosniff' })
  return data
})
