// The one formatting module: days, times and "today" in the workshop's zone, 24-hour clock.
// Check values from the IANA tz database (Pacific/Auckland is UTC+13 in December, daylight
// time; Pacific/Kiritimati is UTC+14 all year; America/Los_Angeles is UTC−8 in December).
import { describe, expect, it } from 'vitest'
import { addCalendarDays, dayIn, formatDateTime, formatDay, formatNumber, formatTime, registerZoneOffsets, todayIn, workshopLocale, zoneOffsets } from '#shared/utils/workshop-format'

describe('workshop formatting', () => {
  it('takes today from the workshop zone, not from UTC', () => {
    const lateUtc = new Date('2026-12-03T19:40:00Z')
    expect(todayIn('UTC', lateUtc)).toBe('2026-12-03')
    expect(todayIn('Pacific/Auckland', lateUtc)).toBe('2026-12-04') // 19:40Z + 13 h = 08:40 next day
    expect(todayIn('Pacific/Kiritimati', lateUtc)).toBe('2026-12-04') // + 14 h
    expect(todayIn('America/Los_Angeles', new Date('2026-12-04T05:00:00Z'))).toBe('2026-12-03') // − 8 h
  })

  it('writes one day style, one time style and both, on a 24-hour clock', () => {
    const at = '2026-12-03T19:05:00Z'
    expect(formatTime(at, 'UTC')).toBe('19:05')
    expect(formatTime(at, 'Pacific/Auckland')).toBe('08:05')
    expect(formatTime('2026-12-03T00:30:00Z', 'UTC')).toBe('00:30') // midnight is 00, never 24 or 12 am
    expect(formatDay(at, 'UTC')).toBe('Thu 3 Dec 2026')
    expect(formatDay(at, 'Pacific/Auckland')).toBe('Fri 4 Dec 2026')
    expect(formatDateTime(at, 'Pacific/Auckland')).toBe('Fri 4 Dec 2026 08:05')
    expect(formatDateTime(new Date(at), 'America/Los_Angeles')).toBe('Thu 3 Dec 2026 11:05')
  })

  it('writes a calendar day as itself in every zone', () => {
    for (const zone of ['UTC', 'Pacific/Kiritimati', 'Pacific/Pago_Pago']) {
      expect(formatDay('2026-12-04', zone)).toBe('Fri 4 Dec 2026')
      expect(dayIn('2026-12-04', zone)).toBe('2026-12-04')
    }
  })

  it('adds calendar days across months and years', () => {
    expect(addCalendarDays('2026-12-31', 1)).toBe('2027-01-01')
    expect(addCalendarDays('2028-03-01', -1)).toBe('2028-02-29') // 2028 is a leap year (Gregorian rule)
  })

  it('writes the day in the workshop\'s locale and keeps the 24-hour clock in both', () => {
    const at = '2026-12-03T19:05:00Z'
    expect(formatDay(at, 'UTC', 'en-US')).toBe('Thu, Dec 3, 2026')
    expect(formatDay('2027-04-01', 'Pacific/Kiritimati', 'en-US')).toBe('Thu, Apr 1, 2027') // a Thursday (Gregorian calendar)
    expect(formatTime(at, 'America/Los_Angeles', 'en-US')).toBe('11:05')
    expect(formatTime('2026-12-03T00:30:00Z', 'UTC', 'en-US')).toBe('00:30')
    expect(formatDateTime(at, 'Pacific/Auckland', 'en-US')).toBe('Fri, Dec 4, 2026 08:05')
    expect(formatDateTime(at, 'Pacific/Auckland', 'en-GB')).toBe('Fri 4 Dec 2026 08:05')
  })

  it('writes numbers with a decimal point and thousands commas, and takes an unknown locale as en-GB', () => {
    expect(formatNumber(1234.5, 1, 'en-GB')).toBe('1,234.5')
    expect(formatNumber(1234.5, 1, 'en-US')).toBe('1,234.5')
    expect(formatNumber(7)).toBe('7')
    expect(formatNumber(Number.NaN)).toBe('—')
    expect(workshopLocale('en-US')).toBe('en-US')
    expect(workshopLocale('de-DE')).toBe('en-GB')
    expect(workshopLocale(null)).toBe('en-GB')
  })
})

// The module writes from the parts itself and asks Intl only for a zone's offset (and not even
// that for a registered span). The reference here is Intl itself: ECMA-402's DateTimeFormat on
// the IANA tz rules Node carries, and its NumberFormat.
describe('the parts written without Intl match Intl', () => {
  const kept = new Map<string, Intl.DateTimeFormat>()
  const intl = (locale: string, o: Intl.DateTimeFormatOptions) => (ms: number, zone: string) => {
    const key = `${locale} ${JSON.stringify(o)} ${zone}`
    if (!kept.has(key)) kept.set(key, new Intl.DateTimeFormat(locale, { ...o, timeZone: zone }))
    return kept.get(key)!.format(ms)
  }
  const intlDay = intl('en-CA', { year: 'numeric', month: '2-digit', day: '2-digit' })
  const intlTime = intl('en-GB', { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
  const intlWeekday = intl('en-GB', { weekday: 'short' })
  const ZONES = ['Europe/London', 'America/Los_Angeles', 'Pacific/Auckland', 'Asia/Kolkata', 'Australia/Lord_Howe', 'Pacific/Chatham', 'America/St_Johns', 'UTC']
  // a seeded walk over 2026-2027 in uneven steps (about 19 h 7 min), so every hour and both sides of each change are met
  const instants = Array.from({ length: 900 }, (_, i) => Date.UTC(2026, 0, 1) + i * 68_820_000 + (i % 7) * 60_000)

  it('days, times and weekdays in eight zones, with and without the zone\'s offsets registered', () => {
    for (const zone of ZONES) {
      const check = () => {
        for (const ms of instants) {
          expect(dayIn(ms, zone), `${zone} ${new Date(ms).toISOString()}`).toBe(intlDay(ms, zone))
          expect(formatTime(ms, zone), `${zone} ${new Date(ms).toISOString()}`).toBe(intlTime(ms, zone))
          expect(formatDay(ms, zone).slice(0, 3)).toBe(intlWeekday(ms, zone))
        }
      }
      check()
      registerZoneOffsets(zoneOffsets(zone, Date.UTC(2025, 11, 1), Date.UTC(2028, 0, 1)))
      check()
    }
  })

  it('finds each offset change to the minute: Europe/London 2026 at 01:00 UTC on the last Sundays of March and October (EU Directive 2000/84/EC)', () => {
    const t = zoneOffsets('Europe/London', Date.UTC(2026, 0, 1), Date.UTC(2027, 0, 1))
    expect(t.offsets).toEqual([[Date.UTC(2026, 0, 1), 0], [Date.UTC(2026, 2, 29, 1), 60], [Date.UTC(2026, 9, 25, 1), 0]])
    // Lord Howe Island shifts by half an hour (IANA tz database: +10:30 standard, +11 summer)
    const lh = zoneOffsets('Australia/Lord_Howe', Date.UTC(2026, 0, 1), Date.UTC(2027, 0, 1))
    expect(lh.offsets.map(([, m]) => m)).toEqual([660, 630, 660])
  })

  it('writes numbers as Intl.NumberFormat does in both locales, rounding and signs included', () => {
    let seed = 20261205
    const rand = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 2 ** 32
    const values = [0, -0, 0.5, 1.5, 2.5, -2.5, 1.005, 1.015, 0.045, -0.001, 999.995, 1e6, 123456789.125, 1e-7, -3e-9, 5e21, -987654.3219, 1e20, 2 ** 53,
      ...Array.from({ length: 2000 }, () => (rand() - 0.5) * 10 ** Math.floor(rand() * 12))]
    for (const locale of ['en-GB', 'en-US'] as const) {
      const reference = [0, 1, 2, 3].map(d => new Intl.NumberFormat(locale, { minimumFractionDigits: d, maximumFractionDigits: d }))
      for (const v of values) {
        for (const digits of [0, 1, 2, 3]) {
          expect(formatNumber(v, digits, locale), `${v} to ${digits}`).toBe(reference[digits]!.format(v))
        }
      }
    }
  })

  it('writes September the same on every ICU: Sep', () => {
    expect(formatDay('2026-09-10', 'UTC')).toBe('Thu 10 Sep 2026')
    expect(formatDay('2026-09-10', 'UTC', 'en-US')).toBe('Thu, Sep 10, 2026')
  })
})
