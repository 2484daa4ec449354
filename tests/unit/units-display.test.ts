// Display units: exact NIST SP 811 factors (1 lb = 0.45359237 kg, 1 in = 0.0254 m,
// 1 US gal = 3.785411784 L, °F = 1.8 °C + 32) and round trips back to metric.
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { consumableWeightFromDisplay, consumableWeightToDisplay, displayNumber, formatUnits, fromDisplay, inUnits, inputValue, metricValue, tempLabel, toDisplay } from '#shared/utils/units-display'

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

describe('display units for tables, inputs and bags', () => {
  it('converts density, bag counts and input values', () => {
    // 1 kg/L = (1 / 0.45359237) lb × 3.785411784 per US gal = 8.3454 lb/US gal (NIST SP 811 factors)
    expect(formatUnits.density(1, 'imperial')).toBe('8.345 lb/US gal')
    expect(formatUnits.density(1.6, 'metric')).toBe('1.600 kg/L')
    expect(formatUnits.bags(2, 25, 'metric')).toBe('2 × 25 kg')
    expect(formatUnits.bags(2, 25, 'imperial')).toBe('2 × 55.1 lb') // 25 / 0.45359237 = 55.12
    expect(formatUnits.bags(3, 22.6796185, 'imperial')).toBe('3 × 50 lb') // a 50 lb bag is 22.6796185 kg
    expect(displayNumber('volume', 3.785411784, 'imperial')).toBe('1.00')
    expect(inputValue('temp', 18, 'imperial', 1)).toBe(64.4) // 18 × 1.8 + 32
    expect(inputValue('mass', null, 'imperial')).toBe('')
    expect(metricValue('temp', 64.4, 'imperial')).toBeCloseTo(18, 9)
    expect(metricValue('mass', '', 'imperial')).toBe('')
  })

  it('round-trips density and temperature differences', () => {
    fc.assert(fc.property(fc.double({ min: 0.01, max: 50, noNaN: true }), (v) => {
      expect(fromDisplay.density(toDisplay.density(v, 'imperial'), 'imperial')).toBeCloseTo(v, 9)
      expect(fromDisplay.tempDelta(toDisplay.tempDelta(v, 'imperial'), 'imperial')).toBeCloseTo(v, 9)
    }))
  })
})

describe('temperature labels', () => {
  it('rewrites a °C band in °F and leaves metric alone', () => {
    expect(tempLabel('10–15 °C', 'imperial')).toBe('50–59 °F') // 10 °C = 50 °F, 15 °C = 59 °F
    expect(tempLabel('< 10 °C', 'imperial')).toBe('< 50 °F')
    expect(tempLabel('10–15 °C', 'metric')).toBe('10–15 °C')
  })
})

describe('stored sentences in the display units', () => {
  it('rewrites each figure in kg or °C to as many decimals as it was written with', () => {
    const short = 'Lot L-7 will not cover the plaster planned from it: 12.3 kg short.'
    expect(inUnits(short, 'metric')).toBe(short)
    // 12.3 / 0.45359237 = 27.12 lb (NIST SP 811)
    expect(inUnits(short, 'imperial')).toBe('Lot L-7 will not cover the plaster planned from it: 27.1 lb short.')
    // °F = 1.8 × °C + 32 (NIST SP 811): 12.0 °C = 53.6 °F, 15 °C = 59 °F, 40 °C = 104 °F
    expect(inUnits('Slurry at 12.0 °C is below 15 °C: about 40 °C', 'imperial')).toBe('Slurry at 53.6 °F is below 59 °F: about 104 °F')
  })

  it('leaves other figures and units alone', () => {
    const s = 'Mould M-1 reaches its expected life (96 pulls + 4 planned ≥ 100); 0.72 kg/L; 5–99 %; kgs'
    expect(inUnits(s, 'imperial')).toBe(s)
  })
})

describe('a consumable weight per unit', () => {
  it('reads per square foot, per foot or each on imperial (NIST SP 811 Appendix B)', () => {
    // 1 lb/ft² = 4.882428 kg/m² and 1 lb/ft = 1.488164 kg/m (NIST SP 811, B.9 factors)
    expect(consumableWeightToDisplay(4.882428, 'm2', 'imperial')).toBeCloseTo(1, 6)
    expect(consumableWeightToDisplay(1.488164, 'm', 'imperial')).toBeCloseTo(1, 6)
    expect(consumableWeightToDisplay(0.45359237, 'each', 'imperial')).toBeCloseTo(1, 12)
    expect(consumableWeightFromDisplay(1, 'm2', 'imperial')).toBeCloseTo(4.882428, 5)
    expect(consumableWeightToDisplay(0.35, 'm2', 'metric')).toBe(0.35)
  })

  it('round-trips', () => {
    fc.assert(fc.property(fc.double({ min: 0, max: 100, noNaN: true }), fc.constantFrom('m2' as const, 'm' as const, 'each' as const), fc.constantFrom('metric' as const, 'imperial' as const), (v, unit, u) => {
      expect(consumableWeightFromDisplay(consumableWeightToDisplay(v, unit, u), unit, u)).toBeCloseTo(v, 9)
    }))
  })
})
