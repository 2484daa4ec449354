/**
 * Field names in the words a person sees. Schemas and the plaster model name fields as the
 * code does (waterTempC, walls[4].lengthM) so forms can put a message beside its input; every
 * message a person reads goes through `inUserWords`, which puts the form's label in place of
 * the name (Water temperature, Wall 5, Shortest piece) and says "is required" for an empty
 * required field. Used by the server's one 422 (server/utils/errors.ts) and by the forms'
 * own check (app/composables/useFormErrors.ts). Pure.
 */

/** The label of each field name, as the forms show it (the unit beside it left out). */
export const FIELD_LABELS: Record<string, string> = {
  waterTempC: 'Water temperature',
  powderTempC: 'Powder temperature',
  slurryTempC: 'Slurry temperature',
  shopTempC: 'Shop temperature',
  defaultShopTempC: 'Usual shop temperature',
  locale: 'Date style',
  consistency: 'Consistency',
  plasterKg: 'Plaster weight',
  waterKg: 'Water weight',
  cavityLitres: 'Cavity',
  cavities: 'Cavities',
  castType: 'Cast',
  surfaceAreaM2: 'Face area',
  shellThicknessMm: 'Shell thickness',
  quantityPerCast: 'Quantity per cast',
  consumableId: 'Consumable',
  kgPerUnit: 'Weight per unit',
  wastePct: 'Waste allowance',
  setFactor: 'Set factor',
  maxDwellMinutes: 'Longest time in the mould',
  prepMinutes: 'Preparation time',
  cleanMinutes: 'Cleaning time',
  minPieceM: 'Shortest piece',
  castLengthM: 'Cast length',
  sparesPct: 'Spares',
  runM: 'Run length',
  piecesNeeded: 'Quantity',
  lotId: 'Plaster lot',
  gradeId: 'Plaster grade',
  mouldId: 'Mould',
  profile: 'Profile',
  jobItemId: 'Job item',
  jobId: 'Job',
  casterId: 'Caster',
  benchId: 'Bench',
  slotStart: 'Start',
  useBy: 'Use by',
  receivedOn: 'Received on',
  bagKg: 'Bag weight',
  bagsReceived: 'Bags received',
  lotCode: 'Lot code',
  humidityPct: 'Humidity',
  tempC: 'Temperature',
  dryingTempC: 'Room temperature',
  dryingHumidityPct: 'Room humidity',
  expectedPulls: 'Expected pulls',
  dueOn: 'Due on',
  // rates and quotes (shared/utils/quote-schemas.ts)
  currency: 'Currency',
  plasterPerBag: 'Plaster per bag',
  mouldPerProfile: 'New mould',
  castPerLength: 'Casting per length',
  castPerPiece: 'Casting per piece',
  fettlePerPiece: 'Fettling per piece',
  fixPerMetre: 'Fixing per metre',
  deliveryPerTrip: 'Delivery per trip',
  labourPerHour: 'Labour per hour',
  pricePerBag: 'Price per bag',
  hours: 'Hours',
  marginPct: 'Margin',
  taxPct: 'Tax',
  depositPct: 'Deposit',
  plasterKgPerLength: 'Plaster per length',
  plasterKgEach: 'Plaster per piece',
  projectionM: 'Projection',
  sawCutM: 'Saw cut',
  cornerBlockLegM: 'Corner block leg',
  newMould: 'New mould needed',
  clientOrgId: 'Client',
  deliveries: 'Deliveries',
  title: 'Title',
  depositMinor: 'Deposit',
  jobCode: 'Job code',
  dispatchId: 'Dispatch note',
  stage: 'Stage',
  unitPrice: 'Unit price',
  reason: 'Reason',
  newSite: 'New site',
  amount: 'Amount',
  method: 'Paid by',
  paidOn: 'Paid on',
  siteId: 'Site',
  name: 'Name',
  role: 'Role',
  address: 'Address',
  postcode: 'Postcode',
  openingHours: 'Opening hours',
  parking: 'Parking',
  lifting: 'Lifting',
  phone: 'Phone',
  mailProgress: 'Progress mail',
  mailSamples: 'Sample mail',
  mailDispatch: 'Dispatch mail',
  mailInvoices: 'Invoice mail',
  shiftBreaks: 'Breaks',
  maxMixes: 'Mixes at once',
  leadDays: 'Lead time',
  startedOn: 'Started on',
  availableFrom: 'Available from',
  assignedTo: 'Who does it',
  fromDay: 'From',
  toDay: 'To',
  workingDays: 'Working days',
  shiftStart: 'Shift start',
  shiftEnd: 'Shift end',
  // crates and deliveries (shared/utils/delivery-schemas.ts)
  pieceIds: 'Pieces',
  crateIds: 'Crates',
  deliveryDay: 'Delivery day',
  fixingOn: 'Fixing from',
  vehicle: 'Vehicle',
  receiverName: 'Received by',
  signature: 'Signature',
  photoId: 'Photo',
  broken: 'Broken pieces',
  crateMaxKg: 'Heaviest crate',
}

const segments = (path: string) => path.replace(/\[(\d+)\]/g, '.$1').split('.').filter(Boolean)

/**
 * The label of a field path: 'waterTempC' → 'Water temperature', 'walls.4.lengthM' or
 * 'walls[4].lengthM' → 'Wall 5', 'walls.4' → 'Wall 5'; a name without a label stays as it is.
 */
export function fieldLabel(path: string): string {
  const s = segments(path)
  const wall = s.indexOf('walls')
  if (wall >= 0 && /^\d+$/.test(s[wall + 1] ?? '')) return `Wall ${Number(s[wall + 1]) + 1}`
  if (s[0] === 'walls' && s.length === 1) return 'Walls'
  for (let i = s.length - 1; i >= 0; i--) {
    const label = FIELD_LABELS[s[i]!]
    if (label) return label
  }
  return path
}

const NAME = /walls(?:\[\d+\]|\.\d+)(?:\.lengthM)?|\b[a-z]+[A-Z][A-Za-z]*\b/g

/**
 * A message in the user's words: code names (camelCase names anywhere, a plain name such as
 * 'consistency' only where it leads the message) become their labels; an empty required field
 * says it is required. `value` is what was sent for the field, when known.
 */
export function inUserWords(field: string, message: string, value?: unknown, known = false): string {
  const label = fieldLabel(field)
  // an empty field says it is required, unless its schema already asks in a sentence of its own
  // ("choose a mould or name a profile"): only the generic shapes are replaced
  const leaf = field.split('.').pop() ?? field
  const generic = message.startsWith(leaf) || /^(invalid|expected|required)\b/i.test(message)
  if (known && generic && (value === undefined || value === null || value === '') && label !== field) return `${label} is required`
  let out = message.replace(NAME, m => (m.startsWith('walls') || FIELD_LABELS[m] ? fieldLabel(m) : m))
  const lead = out.match(/^([a-z]+)\b/)?.[1]
  if (lead && FIELD_LABELS[lead]) out = FIELD_LABELS[lead] + out.slice(lead.length)
  return out
}

/** The value at a dotted field path in a request body, for inUserWords. */
export function valueAt(body: unknown, path: (string | number | symbol)[]): unknown {
  let v = body
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined
    v = (v as Record<string, unknown>)[String(k)]
  }
  return v
}
