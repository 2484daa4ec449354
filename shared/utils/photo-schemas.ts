// Schemas for the photo routes: the multipart fields of an upload (strings on the wire), a
// caption or share change, and the ids in the URL.
import { z } from 'zod'
import { idText } from './input-fields'

const caption = z.string().trim().max(300, { message: 'caption must be at most 300 characters' })
  .transform(v => v || null)

/** multipart fields arrive as text: "true"/"1"/"on" from a checkbox mean shared */
const sharedFlag = z.enum(['true', 'false', '1', '0', 'on', 'off'], { error: 'shared must be true or false' })
  .transform(v => v === 'true' || v === '1' || v === 'on')

const optionalId = (field: string) => z.union([z.literal('').transform(() => null), idText(field)])
  .optional().transform(v => v ?? null)

export const photoUploadFieldsSchema = z.object({
  caption: caption.optional().transform(v => v ?? null),
  shared: sharedFlag.optional().transform(v => v ?? false),
  pieceId: optionalId('pieceId'),
  pourId: optionalId('pourId'),
  /**
   * The tablet's id for this upload (its outbox entry): a retried upload with the same id is
   * answered with the first one's photos and stores nothing again (server/services/photos.ts).
   */
  actionId: z.uuid({ error: 'actionId must be a UUID' }).optional(),
})
export type PhotoUploadFields = z.infer<typeof photoUploadFieldsSchema>

export const photoPatchSchema = z.object({
  caption: caption.nullable().optional(),
  shared: z.boolean({ error: 'shared must be true or false' }).optional(),
}).refine(v => v.caption !== undefined || v.shared !== undefined, { message: 'give caption or shared', path: ['caption'] })
export type PhotoPatch = z.infer<typeof photoPatchSchema>

export const photoIdParamSchema = z.object({ id: z.uuid({ message: 'id must be a photo id' }) })

export const photoVariantParamsSchema = z.object({
  id: z.uuid({ message: 'id must be a photo id' }),
  variant: z.enum(['thumb', 'display'], { error: 'variant must be thumb or display' }),
})

/** At most this many files in one upload request. */
export const PHOTO_MAX_FILES = 12
