// The lots as CSV (lead), with the figures the Lots page shows: stock on hand and its warnings
// beside what was received, masses in the workshop's units with the unit in the header; the price
// per bag in the workshop's currency as the import reads it (18.50).
import { lotsWithStock } from '../../services/catalogue'
import { workshopsRepo } from '../../repos/workshops'
import { UNIT_LABELS, displayNumber } from '#shared/utils/units-display'
import { ratesRepo } from '../../repos/rates'
import { minorDigits } from '#shared/utils/money'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const [lots, ws, rates] = await Promise.all([lotsWithStock(actor.workshopId), workshopsRepo.get(useDb(), actor.workshopId), ratesRepo.get(useDb(), actor.workshopId)])
  // a price as the import reads it back: the amount in the workshop's currency, exact (minor units / 10^digits)
  const digits = minorDigits(rates.currency)
  const price = (minor: number | null) => (minor === null ? '' : digits ? `${Math.trunc(minor / 10 ** digits)}.${String(minor % 10 ** digits).padStart(digits, '0')}` : String(minor))
  const u = ws?.units ?? 'metric'
  const mass = UNIT_LABELS[u].mass
  return sendCsvRows(event, 'setline-lots.csv', lots.map(l => ({
    lot_code: l.lotCode, grade: l.gradeName, bags_received: l.bagsReceived, bag: displayNumber('mass', l.bagKg, u, 2),
    received_on: l.receivedOn, use_by: l.useBy ?? '', on_hand: displayNumber('mass', l.stock.onHandKg, u, 1), on_hand_bags: l.stock.onHandBags,
    warnings: l.stock.warnings.join(' '), archived: l.archivedAt !== null, notes: l.notes ?? '',
    price_per_bag: price(l.pricePerBag),
  })), [
    { key: 'lot_code', header: 'lot code' }, { key: 'grade', header: 'grade' }, { key: 'bags_received', header: 'bags received', number: true },
    { key: 'bag', header: `bag (${mass})`, number: true }, { key: 'received_on', header: 'received on' }, { key: 'use_by', header: 'use by' },
    { key: 'on_hand', header: `on hand (${mass})`, number: true }, { key: 'on_hand_bags', header: 'on hand (bags)', number: true },
    { key: 'warnings', header: 'warnings' }, { key: 'archived', header: 'archived' }, { key: 'notes', header: 'notes' },
    { key: 'price_per_bag', header: 'price per bag' },
  ])
})
