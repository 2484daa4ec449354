// Shared zod schemas for the workshop's rates and its quotes: the forms and the routes validate
// with the same objects. Amounts travel as integers of the currency's minor unit (money.ts);
// percentages as numbers with at most two decimals.
import { z } from 'zod'
import { PLASTER_LIMITS, RUN_ENDS } from './plaster'
import { dayField, numberIn, optionalText, requiredText, versionField } from './catalogue-schemas'
import { MAX_MINOR } from './money'

const minor = (field: string) => z.number({ error: `${field} must be an amount` })
  .int(`${field} must be a whole number of pence or cents`)
  .min(0, `${field} must not be negative`)
  .max(MAX_MINOR, `${field} is too large`)
const percent = (field: string) => numberIn(field, 0, 1000, '%')
  .refine(v => Math.abs(Math.round(v * 100) - v * 100) < 1e-6, `${field} may have at most two decimal places`)

export const ratesSchema = z.object({
  currency: z.string({ error: 'currency is required' }).trim().toUpperCase()
    .regex(/^[A-Z]{3}$/, 'currency must be a three-letter ISO 4217 code such as GBP')
    .refine((c) => {
      try {
        new Intl.NumberFormat('en', { style: 'currency', currency: c })
        return true
      }
      catch {
        return false
      }
    }, 'currency must be a three-letter ISO 4217 code such as GBP'),
  plasterPerBag: minor('plasterPerBag'),
  mouldPerProfile: minor('mouldPerProfile'),
  castPerLength: minor('castPerLength'),
  castPerPiece: minor('castPerPiece'),
  fettlePerPiece: minor('fettlePerPiece'),
  fixPerMetre: minor('fixPerMetre'),
  deliveryPerTrip: minor('deliveryPerTrip'),
  // the job's actual cost (job-cost.ts) prices time at this; left out, the saved rate is kept
  labourPerHour: minor('labourPerHour').optional(),
  marginPct: percent('marginPct'),
  taxPct: percent('taxPct'),
  depositPct: numberIn('depositPct', 0, 100, '%')
    .refine(v => Math.abs(Math.round(v * 100) - v * 100) < 1e-6, 'depositPct may have at most two decimal places'),
})
export const ratesPutSchema = ratesSchema.extend({ version: versionField })

const L = PLASTER_LIMITS
const end = z.enum(RUN_ENDS, { error: 'a wall end must be square, internal, external or return' }).optional()
const takeOffWall = z.object({
  lengthM: numberIn('lengthM', L.wallLengthM.min, L.wallLengthM.max, 'm', { exclusive: true }),
  start: end,
  end,
}, { error: 'each wall must be an object with lengthM' })

const takeOffRun = z.object({
  profile: requiredText('profile', 120),
  walls: z.array(takeOffWall, { error: 'walls must be a list' }).min(1, 'walls must list at least one wall').max(200, 'walls must list at most 200 walls'),
  castLengthM: numberIn('castLengthM', L.castLengthM.min, L.castLengthM.max, 'm', { exclusive: true }),
  minPieceM: numberIn('minPieceM', 0, 20, 'm'),
  sparesPct: numberIn('sparesPct', 0, 100, '%'),
  projectionM: numberIn('projectionM', L.projectionM.min, L.projectionM.max, 'm', { exclusive: true }).optional(),
  sawCutM: numberIn('sawCutM', L.sawCutM.min, L.sawCutM.max, 'm').optional(),
  cornerBlockLegM: numberIn('cornerBlockLegM', L.cornerBlockLegM.min, L.cornerBlockLegM.max, 'm', { exclusive: true }).optional(),
  plasterKgPerLength: numberIn('plasterKgPerLength', 0, 500, 'kg', { exclusive: true }),
  newMould: z.boolean({ error: 'newMould must be true or false' }),
})

const takeOffOrnament = z.object({
  name: requiredText('name', 120),
  count: numberIn('count', 1, 10000, 'pieces', { int: true }),
  plasterKgEach: numberIn('plasterKgEach', 0, 500, 'kg', { exclusive: true }),
  newMould: z.boolean({ error: 'newMould must be true or false' }),
})

export const takeOffSchema = z.object({
  rooms: z.array(z.object({
    name: requiredText('name', 120),
    runs: z.array(takeOffRun, { error: 'runs must be a list' }).max(50, 'a room may have at most 50 runs'),
    ornaments: z.array(takeOffOrnament, { error: 'ornaments must be a list' }).max(100, 'a room may have at most 100 kinds of ornament'),
  }), { error: 'rooms must be a list' }).min(1, 'rooms must list at least one room').max(100, 'rooms must list at most 100 rooms'),
  bagKg: numberIn('bagKg', 0, 100, 'kg', { exclusive: true }),
  deliveries: numberIn('deliveries', 0, 100, 'trips', { int: true }),
  fixing: z.boolean({ error: 'fixing must be true or false' }),
})
export type TakeOffInput = z.infer<typeof takeOffSchema>

export const quoteCreateSchema = z.object({
  title: requiredText('title', 200),
  clientOrgId: z.number({ error: 'clientOrgId must be a client' }).int().positive().nullable().optional(),
  notes: optionalText('notes', 4000),
  takeOff: takeOffSchema,
})
export const quotePatchSchema = z.object({
  title: requiredText('title', 200).optional(),
  clientOrgId: z.number({ error: 'clientOrgId must be a client' }).int().positive().nullable().optional(),
  takeOff: takeOffSchema.optional(),
  version: versionField,
})
/** Send or revise: the body names the quote's version the lead saw. */
export const quoteVersionedSchema = z.object({ version: versionField })
/** ?revision=N on the PDF route: a revision number, or the latest when left out. */
export const quotePdfQuerySchema = z.object({
  revision: z.coerce.number({ error: 'revision must be a number' }).int('revision must be a whole number').positive('revision must be positive').max(10000, 'revision is not one this quote has').optional(),
})

/** The client's decision on the revision they read; asking for changes needs a comment. */
export const quoteDecisionSchema = z.object({
  revision: z.number({ error: 'revision is required (the revision you read)' }).int('revision must be a whole number').positive('revision must be positive').max(10000, 'revision is not one this quote has'),
  decision: z.enum(['accept', 'changes'], { error: 'decision must be accept or changes' }),
  comment: optionalText('comment', 2000),
}).refine(v => v.decision !== 'changes' || !!v.comment, { path: ['comment'], message: 'Say what you would like changed' })

/** The accepted quote made into a job: its code, and a site of the quote's client picked or made. */
export const quoteJobSchema = z.object({
  jobCode: requiredText('jobCode', 40).regex(/^[\w.\-/ ]+$/, 'jobCode may use letters, digits, spaces and . - / _'),
  title: optionalText('title', 160),
  dueOn: dayField('dueOn').nullable().optional(),
  siteId: z.number({ error: 'siteId must be a site' }).int().positive().max(Number.MAX_SAFE_INTEGER).nullable().optional(),
  newSite: z.object({
    name: requiredText('name', 160),
    address: requiredText('address', 500),
    postcode: optionalText('postcode', 20),
  }, { error: 'newSite must be a site with a name and an address' }).nullable().optional(),
}).refine(v => !!v.siteId !== !!v.newSite, { path: ['siteId'], message: 'Pick one of the client\'s sites or add a new one' })
