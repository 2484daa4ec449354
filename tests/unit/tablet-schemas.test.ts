// Tablet PIN rules: 4 to 8 digits, not one digit repeated, not a straight run up or down.
import { describe, expect, it } from 'vitest'
import { tabletNewPin, tabletPinSetSchema, tabletPinWeakness, tabletSwitchSchema } from '#shared/utils/tablet-schemas'

const ok = (pin: unknown) => tabletNewPin.safeParse(pin).success

describe('tablet PIN', () => {
  it('takes 4 to 8 digits that are not easy', () => {
    for (const pin of ['4071', '5286', '27194', '90817263', '1235', '1243', '0001']) expect(ok(pin), pin).toBe(true)
  })

  it('refuses the wrong length, non-digits and non-strings', () => {
    for (const pin of ['', '407', '123456780', '40 71', '4O71', '٤٠٧١', 4071, null]) expect(ok(pin), String(pin)).toBe(false)
  })

  it('refuses one digit repeated and runs up or down, wrapping past 9 and 0', () => {
    for (const pin of ['0000', '1111', '99999999', '1234', '0123', '3456789', '4321', '9876', '7890', '8901', '0987', '21098']) {
      expect(ok(pin), pin).toBe(false)
      expect(tabletPinWeakness(pin), pin).toBeDefined()
    }
  })

  it('names the field: pin and password when setting, userId and pin when switching', () => {
    const set = tabletPinSetSchema.safeParse({ pin: '1111' })
    expect(set.success).toBe(false)
    expect(set.error!.issues.map(i => i.path.join('.')).sort()).toEqual(['password', 'pin'])
    const sw = tabletSwitchSchema.safeParse({ userId: -1, pin: 'abcd' })
    expect(sw.error!.issues.map(i => i.path.join('.')).sort()).toEqual(['pin', 'userId'])
    // an older easy PIN still switches: only new PINs are held to the rules
    expect(tabletSwitchSchema.safeParse({ userId: 3, pin: '1234' }).success).toBe(true)
  })
})
