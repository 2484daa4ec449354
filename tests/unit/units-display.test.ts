// Display units: exact NIST SP 811 factors (1 lb = 0.45359237 kg, 1 in = 0.0254 m,
// 1 US gal = 3.785411784 L, °F = 1.8 °C + 32) and round trips back to metric.
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { formatUnits, fromDisplay, toDisplay } from '#shared/utils/units-display'

describe('display units', () => {
  it('formats metric and imperial with their units', () => {
    expect(formatUnits.mass(25, 'metric')).toBe('25.00 kg')
    expect(formatUnits.mass(25, 'imperial')).toBe('55.12 lb') // 25 / 0.45359237 = 55.1156 (NIST SP 811)
    expect(formatUnits.temp(20, 'imperial')).toBe('68.0 °F')
    expect(formatUnits.temp(-40, 'imperial')).toBe('-40.0 °F') // the scales cross at −40
    expect(formatUnits.volume(3.785411784, 'imperial')).toBe('1.00 US gal')
    expect(formatUnits.length(1.2, 'imperial')).toBe('47.2 in') // 1.2 / 0.0254 = 47.24
    expect(formatUnits.tempDelta(10, 'imperial')).toBe('18 °F') // a difference scales by 1.8 only
    expect(formatUnits.mass(Number.NaN, 'metric')).toBe('— kg')
  })

  it('round-trips every quantity through the display system', () => {
    fc.assert(fc.property(fc.double({ min: -50, max: 5000, noNaN: true }), fc.constantFrom('metric' as const, 'imperial' as const), (v, u) => {
      for (const q of ['mass', 'temp', 'volume', 'length'] as const) {
        expect(fromDisplay[q](toDisplay[q](v, u), u)).toBeCloseTo(v, 9)
      }
    }))
  })
})
