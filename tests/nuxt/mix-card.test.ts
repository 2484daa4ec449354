// Component test of the mix card in a Nuxt environment: the numbers on the card are the
// plaster model's, and they move when the caster changes the mix.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import MixCard from '../../app/components/mix/MixCard.vue'
import { GRADE_PRESETS, mixSummary } from '#shared/utils/plaster'

const grades = [{ id: 1, name: 'Fine casting (beta)', bagKg: 25, grade: GRADE_PRESETS['beta-casting'] }]
const moulds = [{ id: 7, code: 'T-1', casts: 'Test panel', cavityLitres: 1, maxDwellMinutes: 120 }]

// the chart itself needs a real canvas: the browser test covers it
const global = { stubs: { LazyMixSetCurveChart: true, MixSetCurveChart: true } }

function text(w: Awaited<ReturnType<typeof mountSuspended>>, id: string) {
  return w.find(`[data-testid="${id}"]`).text()
}

describe('MixCard', () => {
  it('shows the model\'s batch and window for the chosen mould and grade', async () => {
    const w = await mountSuspended(MixCard, { props: { grades, moulds, units: 'metric', defaultShopTempC: 20 }, global })
    const expected = mixSummary({ cavityLitres: 1, grade: GRADE_PRESETS['beta-casting'], consistency: 70, wastePct: 5, waterTempC: 20, powderTempC: 20, shopTempC: 20, setFactor: 1, maxDwellMinutes: 120 })
    expect(text(w, 'mix-plaster')).toBe(`${expected.batch.plasterKg.toFixed(2)} kg`)
    expect(text(w, 'mix-water')).toBe(`${expected.batch.waterKg.toFixed(2)} kg`)
    // The beta casting preset at consistency 70 in a 20 °C shop opens in 20–45 min (common
    // practice, no published source); the window closes after the mould's 120 min dwell
    const [open, close] = text(w, 'mix-window').replace(' min', '').split('–').map(Number)
    expect(open).toBeGreaterThanOrEqual(20)
    expect(open).toBeLessThanOrEqual(45)
    expect(close! - open!).toBe(120)
  })

  it('moves the window later and lowers the strength when the caster adds water', async () => {
    const w = await mountSuspended(MixCard, { props: { grades, moulds, units: 'metric', defaultShopTempC: 20 }, global })
    const before = Number(text(w, 'mix-window').split('–')[0])
    await w.find('#mix-consistency').setValue('80')
    const after = Number(text(w, 'mix-window').split('–')[0])
    expect(after).toBeGreaterThan(before)
    expect(Number(text(w, 'mix-strength').replace('× ', ''))).toBeLessThan(1)
  })

  it('shows imperial units when the workshop uses them', async () => {
    const w = await mountSuspended(MixCard, { props: { grades, moulds, units: 'imperial', defaultShopTempC: 20 }, global })
    expect(text(w, 'mix-plaster')).toMatch(/ lb$/)
    // 20 °C shop → water at 68 °F → slurry at 68.0 °F (NIST SP 811: °F = 1.8 °C + 32)
    expect(text(w, 'mix-slurry-t')).toBe('68.0 °F')
  })

  it('says what is wrong instead of showing numbers for an impossible mix', async () => {
    const w = await mountSuspended(MixCard, { props: { grades, moulds, units: 'metric', defaultShopTempC: 20 }, global })
    await w.find('#mix-consistency').setValue('10')
    expect(text(w, 'mix-error')).toMatch(/consistency/)
  })
})
