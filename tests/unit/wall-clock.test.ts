// A day and a clock typed in the workshop's zone as an instant (shared/utils/wall-clock.ts).
// Check values from the IANA tz database's rules: Europe/London, rule EU, summer time from
// 01:00 UTC on the last Sunday of March to 01:00 UTC on the last Sunday of October (29 March and
// 25 October in 2026); America/New_York, rule US, from 2:00 local on the second Sunday of March
// (8 March 2026).
import { describe, expect, it } from 'vitest'
import { wallClockInstant } from '#shared/utils/wall-clock'

describe('wallClockInstant', () => {
  it('reads the clock in the zone, winter and summer', () => {
    expect(wallClockInstant('2026-03-01', '07:40', 'Europe/London')).toBe('2026-03-01T07:40:00.000Z')
    expect(wallClockInstant('2026-07-01', '07:40', 'Europe/London')).toBe('2026-07-01T06:40:00.000Z')
    expect(wallClockInstant('2026-07-01', '07:40', 'America/New_York')).toBe('2026-07-01T11:40:00.000Z')
    expect(wallClockInstant('2026-12-31', '23:30', 'Europe/London')).toBe('2026-12-31T23:30:00.000Z')
  })

  it('moves a clock inside the spring-forward gap on by the gap', () => {
    // 01:30 on 29 March 2026 does not happen in London: the clocks go from 01:00 to 02:00
    expect(wallClockInstant('2026-03-29', '01:30', 'Europe/London')).toBe('2026-03-29T01:30:00.000Z')
    expect(wallClockInstant('2026-03-08', '02:30', 'America/New_York')).toBe('2026-03-08T07:30:00.000Z')
  })

  it('gives nothing for a day or a clock that is not one', () => {
    expect(wallClockInstant('2026-02-30', '08:00', 'Europe/London')).toBe('')
    expect(wallClockInstant('2026-03-01', '25:00', 'Europe/London')).toBe('')
  })
})
