// The shared input building blocks: days and instants PostgreSQL can hold, ids written as text.
import { describe, expect, it } from 'vitest'
import { idText, isCalendarDay, isCalendarInstant } from '#shared/utils/input-fields'
import { dayField, versionField } from '#shared/utils/catalogue-schemas'
import { pourMoveSchema, daySheetQuerySchema } from '#shared/utils/pour-schemas'

describe('isCalendarDay', () => {
  it('takes real days from 1900 to 2999 only', () => {
    for (const d of ['1900-01-01', '2027-02-28', '2028-02-29', '2999-12-31']) expect(isCalendarDay(d), d).toBe(true)
    // 30 February rolls over in Date.parse; year 0 does not exist in PostgreSQL (it answered 500 before)
    for (const d of ['2027-02-30', '2027-02-29', '0000-01-01', '1899-12-31', '3000-01-01', '2027-1-01', '2027-01-01T00:00:00Z', '']) expect(isCalendarDay(d), d).toBe(false)
  })
  it('is what dayField and the board days check', () => {
    expect(dayField('dueOn').safeParse('2027-02-30').error?.issues[0]?.message).toBe('dueOn must be a real date from 1900 to 2999')
    expect(daySheetQuerySchema.safeParse({ day: '0000-01-01' }).success).toBe(false)
  })
})

describe('isCalendarInstant', () => {
  it('takes ISO date-times on a calendar day', () => {
    expect(isCalendarInstant('2027-09-13T09:00:00Z')).toBe(true)
    expect(isCalendarInstant('2027-09-13T09:00:00+02:00')).toBe(true)
    for (const v of ['9999-12-31T23:59:59Z', '+275760-09-13T00:00:00Z', '2027-02-30T09:00:00Z', '2027-09-13', '2027-09-13T25:00:00Z']) expect(isCalendarInstant(v), v).toBe(false)
  })
})

describe('idText', () => {
  const id = idText('id')
  it('reads digits as a positive whole number', () => {
    expect(id.parse('42')).toBe(42)
    expect(id.parse('9007199254740991')).toBe(Number.MAX_SAFE_INTEGER)
  })
  it('refuses anything else with the field in the message', () => {
    for (const v of ['0', '-1', '1e3', '0x10', ' 1', '1.5', 'abc', '99999999999999999999', '1;DROP TABLE users', '', ['1', '2']]) {
      const r = id.safeParse(v)
      expect(r.success, String(v)).toBe(false)
      expect(r.error!.issues[0]!.message).toBe('id must be a positive whole number')
    }
  })
})

describe('versions', () => {
  it('stop at the largest PostgreSQL integer (a larger one answered 500 before)', () => {
    expect(versionField.safeParse(2_147_483_647).success).toBe(true)
    expect(versionField.safeParse(2_147_483_648).success).toBe(false)
    expect(pourMoveSchema.safeParse({ version: 2 ** 31 }).success).toBe(false)
  })
})
