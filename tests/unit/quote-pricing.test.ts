import { describe, it, expect } from 'vitest'
import { MoneyInputError, formatMoney, lineAmount, minorDigits, parseMoney, percentToBasisPoints, shareOf } from '#shared/utils/money'
import { depositFor, priceQuote, takeOff, type TakeOffRoom, type WorkshopRates } from '#shared/utils/quote-pricing'

function fieldOf(fn: () => unknown): string | undefined {
  try {
    fn()
  }
  catch (e) {
    return e instanceof MoneyInputError || (e as { field?: string }).field ? (e as { field: string }).field : undefined
  }
  return undefined
}

describe('money in minor units', () => {
  it('takes the minor digits from the ISO 4217 exponent', () => {
    // ISO 4217: GBP and USD have exponent 2, JPY 0.
    expect(minorDigits('GBP')).toBe(2)
    expect(minorDigits('USD')).toBe(2)
    expect(minorDigits('JPY')).toBe(0)
    expect(fieldOf(() => minorDigits('POUNDS'))).toBe('currency')
  })

  it('reads typed amounts exactly and refuses more decimals than the currency has', () => {
    expect(parseMoney('1,895.84', 'GBP')).toBe(189584)
    expect(parseMoney('0.1', 'GBP')).toBe(10)
    expect(parseMoney('12', 'GBP')).toBe(1200)
    expect(parseMoney('1200', 'JPY')).toBe(1200)
    // 0.1 + 0.2 is not 0.3 in binary floating point; in minor units it is
    expect(parseMoney('0.1', 'EUR') + parseMoney('0.2', 'EUR')).toBe(parseMoney('0.3', 'EUR'))
    expect(fieldOf(() => parseMoney('12.345', 'GBP', 'price per bag'))).toBe('price per bag')
    expect(fieldOf(() => parseMoney('12.5', 'JPY'))).toBe('amount')
    expect(fieldOf(() => parseMoney('-3', 'GBP'))).toBe('amount')
    expect(fieldOf(() => parseMoney('£3', 'GBP'))).toBe('amount')
  })

  it('writes minor units in the workshop currency', () => {
    expect(formatMoney(189584, 'GBP')).toBe('£1,895.84')
    expect(formatMoney(5, 'GBP')).toBe('£0.05')
    expect(formatMoney(1200, 'JPY', 'en-GB')).toBe('JP¥1,200')
    // beyond a float's exact cents: 90 trillion pence still prints to the penny
    expect(formatMoney(9_000_000_000_001, 'GBP')).toBe('£90,000,000,000.01')
  })

  it('rounds a share or a line once, half away from zero', () => {
    expect(shareOf(1850, 1500)).toBe(278) // 277.5 → 278
    expect(shareOf(1849, 1500)).toBe(277) // 277.35
    expect(lineAmount(8.1, 1438)).toBe(11648) // 11 647.8
    expect(lineAmount(0.005, 100)).toBe(1) // 0.5 → 1
    expect(percentToBasisPoints(12.5)).toBe(1250)
    expect(fieldOf(() => percentToBasisPoints(12.345, 'margin'))).toBe('margin')
    expect(fieldOf(() => lineAmount(1.2345, 100, 'metres'))).toBe('metres')
    expect(fieldOf(() => lineAmount(2, 10.5))).toBe('rate')
  })
})

describe('take-off and priced quote: our own worked example', () => {
  // Our own worked example, priced by hand (common practice for what is priced; rates invented):
  // Drawing room: egg-and-dart run on walls 5.0 m and 3.1 m, 3.0 m lengths, shortest piece
  // 0.3 m, no spares → 3 lengths (the run calculator's offcut reuse: 3 + 2 | 1 + 2.1), 9 kg each
  // = 27 kg, new mould; one ceiling centre, 14 kg, existing mould. Hall: four corbels, 3.5 kg
  // each = 14 kg, new mould. Plaster 55 kg → 3 bags of 25 kg.
  const rooms: TakeOffRoom[] = [
    {
      name: 'Drawing room',
      runs: [{ profile: 'Egg-and-dart 150', walls: [{ lengthM: 5.0 }, { lengthM: 3.1 }], castLengthM: 3, minPieceM: 0.3, sparesPct: 0, plasterKgPerLength: 9, newMould: true }],
      ornaments: [{ name: 'Ceiling centre 600', count: 1, plasterKgEach: 14, newMould: false }],
    },
    { name: 'Hall', runs: [], ornaments: [{ name: 'Corbel', count: 4, plasterKgEach: 3.5, newMould: true }] },
  ]
  // Rates in pence: margin 15 %, tax 20 %.
  const rates: WorkshopRates = {
    plasterPerBag: 1850,
    mouldPerProfile: 42000,
    castPerLength: 3500,
    castPerPiece: 2800,
    fettlePerPiece: 900,
    fixPerMetre: 1250,
    deliveryPerTrip: 6000,
    marginBp: 1500,
    taxBp: 2000,
  }

  it('counts lengths, pieces, run, plaster and bags', () => {
    const t = takeOff(rooms, 25)
    expect(t.castLengths).toBe(3)
    expect(t.castPieces).toBe(5)
    expect(t.runM).toBe(8.1)
    expect(t.plasterKg).toBe(55)
    expect(t.bags).toBe(3)
    expect(t.newMoulds).toEqual(['Egg-and-dart 150', 'Corbel'])
  })

  it('prices each line with the margin in its unit price, then tax on the sum', () => {
    const q = priceQuote(takeOff(rooms, 25), rates, { deliveries: 1, fixing: true })
    // By hand: sell rate = rate + 15 % rounded to the penny.
    expect(q.lines.map(l => [l.kind, l.quantity, l.unitPrice, l.amount, l.estimate])).toEqual([
      ['mould', 1, 48300, 48300, 42000],
      ['mould', 1, 48300, 48300, 42000],
      ['cast-length', 3, 4025, 12075, 10500],
      ['cast-piece', 1, 3220, 3220, 2800],
      ['cast-piece', 4, 3220, 12880, 11200],
      ['fettle', 8, 1035, 8280, 7200],
      ['plaster', 3, 2128, 6384, 5550], // 1850 + 277.5 → 2128
      ['fixing', 8.1, 1438, 11648, 10125], // 8.1 × 1438 = 11 647.8
      ['delivery', 1, 6900, 6900, 6000],
    ])
    expect(q.net).toBe(157987)
    expect(q.tax).toBe(31597) // 31 597.4
    expect(q.total).toBe(189584) // £1,895.84
    expect(q.estimate).toBe(137375)
    expect(q.lines.reduce((a, l) => a + l.amount, 0)).toBe(q.net)
    expect(depositFor(q.total, 3000)).toBe(56875) // 56 875.2
  })

  it('leaves out fixing when the client fixes, and delivery when collected', () => {
    const q = priceQuote(takeOff(rooms, 25), rates, { deliveries: 0, fixing: false })
    expect(q.lines.map(l => l.kind)).not.toContain('fixing')
    expect(q.lines.map(l => l.kind)).not.toContain('delivery')
    expect(q.net).toBe(157987 - 11648 - 6900)
  })

  it('names the field of a bad take-off or rate', () => {
    const bad: TakeOffRoom[] = [{ name: 'Hall', runs: [], ornaments: [{ name: 'Corbel', count: 1.5, plasterKgEach: 3, newMould: false }] }]
    expect(fieldOf(() => takeOff(bad, 25))).toBe('rooms[0].ornaments[0].count')
    expect(fieldOf(() => priceQuote(takeOff(rooms, 25), { ...rates, castPerLength: 35.5 }, { deliveries: 1, fixing: true }))).toBe('castPerLength')
    expect(fieldOf(() => priceQuote(takeOff(rooms, 25), { ...rates, marginBp: -1 }, { deliveries: 1, fixing: true }))).toBe('margin')
    expect(fieldOf(() => takeOff([{ ...rooms[0]!, runs: [{ ...rooms[0]!.runs[0]!, walls: [{ lengthM: -1 }] }] }], 25))).toMatch(/^walls/)
  })
})
