// Zod schemas of crates, deliveries, the proof of delivery and calendar feeds, shared by the
// forms and the routes (server/services/deliveries.ts holds the rules). Nuxt auto-imports every
// export of shared/utils, so the names carry a delivery prefix.
import { z } from 'zod'
import { dayField, optionalText, requiredText } from './catalogue-schemas'

const positiveId = (field: string) => z.number({ error: `${field} must be a positive whole number` })
  .int({ error: `${field} must be a positive whole number` }).positive({ error: `${field} must be a positive whole number` })
  .max(Number.MAX_SAFE_INTEGER, { error: `${field} must be a positive whole number` })

/** The most pieces or crates one request names: a lorry load of casts is far fewer (a sanity bound). */
export const DELIVERY_MAX_ROWS = 500

const idList = (field: string, what: string, min: number) => z.array(positiveId(field), { error: `${field} must be a list of ${what}` })
  .min(min, { error: `${field} must name at least one of the ${what}` })
  .max(DELIVERY_MAX_ROWS, { error: `${field} must name at most ${DELIVERY_MAX_ROWS} ${what}` })
  .refine(ids => new Set(ids).size === ids.length, { error: `${field} must not name one twice` })

/** POST /api/jobs/:id/crates: a new crate, with the pieces packed into it (or empty, to fill). */
export const deliveryCrateCreateSchema = z.object({
  pieceIds: idList('pieceIds', 'pieces', 0).optional(),
})
/** POST /api/crates/:id/pieces: pieces packed into a crate. */
export const deliveryCratePackSchema = z.object({
  pieceIds: idList('pieceIds', 'pieces', 1),
})
export type DeliveryCratePackInput = z.infer<typeof deliveryCratePackSchema>

/** POST /api/jobs/:id/deliveries: a delivery of crates (and loose pieces: long lengths travel uncrated) on a day. */
export const deliveryBookSchema = z.object({
  deliveryDay: dayField('deliveryDay'),
  fixingOn: dayField('fixingOn').nullable().optional(),
  vehicle: requiredText('vehicle', 120),
  crateIds: idList('crateIds', 'crates', 0).default([]),
  pieceIds: idList('pieceIds', 'pieces', 0).default([]),
}).refine(v => v.crateIds.length + v.pieceIds.length > 0, { path: ['crateIds'], error: 'crateIds must name at least one crate, or pieceIds a loose piece' })
export type DeliveryBookInput = z.infer<typeof deliveryBookSchema>

/** A signature drawn on the pad, as signature_pad's toDataURL gives it. */
export const DELIVERY_SIGNATURE_PREFIX = 'data:image/png;base64,'
/**
 * The largest signature accepted, characters of the data URL: a signature on a 600 × 240 pad
 * measured 8–40 KB as PNG; 200 000 characters (about 150 KB) leaves room for a wide tablet.
 */
export const DELIVERY_SIGNATURE_MAX_CHARS = 200_000

/** POST /api/deliveries/:id/proof: who received it, their signature, a photo of the load, what arrived broken. */
export const deliveryProofSchema = z.object({
  actionId: z.uuid({ error: 'actionId must be a UUID' }),
  receiverName: requiredText('receiverName', 120),
  signature: z.string({ error: 'signature is required: ask the receiver to sign' })
    .max(DELIVERY_SIGNATURE_MAX_CHARS, { error: 'signature is too large: clear the pad and sign again' })
    // a PNG's base64 always opens with its 8-byte signature, 89 50 4E 47 0D 0A 1A 0A (PNG spec §5.2)
    .refine(s => s.startsWith(`${DELIVERY_SIGNATURE_PREFIX}iVBORw0KGgo`) && /^[A-Za-z0-9+/]+=*$/.test(s.slice(DELIVERY_SIGNATURE_PREFIX.length)),
      { error: 'signature is required: ask the receiver to sign' }),
  photoId: z.uuid({ error: 'photoId must be a photo of the load' }).nullable().optional(),
  broken: z.array(z.object({
    pieceId: positiveId('pieceId'),
    note: optionalText('note', 300),
  }), { error: 'broken must be a list of pieces' }).max(DELIVERY_MAX_ROWS, { error: `broken must name at most ${DELIVERY_MAX_ROWS} pieces` }).default([])
    .refine(b => new Set(b.map(x => x.pieceId)).size === b.length, { error: 'broken must not name a piece twice' }),
})
export type DeliveryProofInput = z.infer<typeof deliveryProofSchema>

/** POST /api/feeds: a feed of the whole workshop, or of one job. */
export const deliveryFeedCreateSchema = z.object({
  jobId: positiveId('jobId').nullable().optional(),
})

/** GET /api/ics/:token: the secret of a feed link (base64url of 32 bytes; anything else finds nothing). */
export const deliveryFeedTokenSchema = z.object({
  token: z.string({ error: 'token must be a feed link' }).regex(/^[A-Za-z0-9_-]{20,100}(\.ics)?$/, { error: 'token must be a feed link' }),
})
