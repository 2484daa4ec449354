// The floor's action schema: the fields each step needs, named when wrong, and the order of steps.
import { describe, expect, it } from 'vitest'
import { floorActionSchema } from '#shared/utils/floor-schemas'
import { FLOOR_DEFECTS, FLOOR_STEPS } from '#shared/utils/floor-steps'

const id = '0b7f6f0e-2f5b-4c1e-9a7e-5d2f3c4b1a09'
const fields = (v: unknown) => {
  const r = floorActionSchema.safeParse(v)
  return r.success ? [] : r.error.issues.map(i => i.path.join('.'))
}

describe('floorActionSchema', () => {
  it('accepts each step with its own data', () => {
    expect(fields({ actionId: id, version: 1, kind: 'start_mixing', waterTempC: 18 })).toEqual([])
    expect(fields({ actionId: id, version: 2, kind: 'poured', plasterKg: 2, waterKg: 1.4, shopTempC: 17, at: '2027-01-04T09:00:00Z' })).toEqual([])
    expect(fields({ actionId: id, version: 3, kind: 'demoulded', result: 'defect', defect: FLOOR_DEFECTS[0] })).toEqual([])
  })

  it('names the bad or missing field', () => {
    expect(fields({ actionId: id, version: 1, kind: 'start_mixing' })).toContain('waterTempC')
    expect(fields({ actionId: 'x', version: 1, kind: 'start_mixing', waterTempC: 18 })).toContain('actionId')
    expect(fields({ actionId: id, version: 2, kind: 'poured', plasterKg: 0, waterKg: 1, shopTempC: 17 })).toContain('plasterKg')
    expect(fields({ actionId: id, version: 3, kind: 'demoulded', result: 'defect' })).toContain('defect')
    expect(fields({ actionId: id, version: 1, kind: 'start_mixing', waterTempC: 18, at: 'soon' })).toContain('at')
  })

  it('orders the steps planned → mixing → setting → demoulded', () => {
    expect([FLOOR_STEPS.start_mixing, FLOOR_STEPS.poured, FLOOR_STEPS.demoulded].map(s => `${s.from}>${s.to}`))
      .toEqual(['planned>mixing', 'mixing>setting', 'setting>demoulded'])
  })
})
