// The one formatting module: days, times and "today" in the workshop's zone, 24-hour clock.
// Check values from the IANA tz database (Pacific/Auckland is UTC+13 in December, daylight
// time; Pacific/Kiritimati is UTC+14 all year; America/Los_Angeles is UTC−8 in December).
import { describe, expect, it } from 'vitest'
import { addCalendarDays, dayIn, formatDateTime, formatDay, formatNumber, formatTime, todayIn, workshopLocale } from '#shared/utils/workshop-format'

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
