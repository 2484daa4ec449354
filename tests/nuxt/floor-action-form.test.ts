// The caster's "Start mixing" form in a Nuxt environment: an in-date lot is offered first and
// chosen by default; an expired lot is marked in the list and, once chosen, raises a caution;
// both write the use-by day in the workshop's day style (its locale from /api/auth/me, mocked),
// never as the stored ISO day; a step recorded late sends the clock typed as an instant in the
// workshop's zone. The lots and the pour are our own example.
import { describe, expect, it } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import type { FloorCardDto } from '#shared/types/floor'
import FloorActionForm from '../../app/components/floor/FloorActionForm.vue'

registerEndpoint('/api/auth/me', () => ({ workshop: { name: 'Example shop', units: 'metric', timezone: 'Europe/London', locale: 'en-GB' } }))

const card = {
  pour: {
    id: 7, version: 1, mouldId: 3, mouldCode: 'CR-9', jobItemId: 11, jobId: 2, jobCode: 'J-9', itemDescription: 'Cornice run',
    casterId: null, casterName: null, gradeId: 1, gradeName: 'Casting plaster', lotId: null, state: 'planned', isSample: false,
    consistency: 70, setFactor: 1, slotStart: '2027-03-01T08:00:00.000Z', slotEnd: '2027-03-01T11:00:00.000Z',
    mixAt: '2027-03-01T08:15:00.000Z', demouldOpenAt: '2027-03-01T09:00:00.000Z', demouldCloseAt: '2027-03-01T10:30:00.000Z',
    plasterKg: 6.4, waterKg: 4.5, warnings: [], overdue: false, situation: 'waiting',
  },
  lots: [
    { id: 21, lotCode: 'FC-NEW', leftKg: 180, useBy: '2027-06-30', expired: false },
    { id: 22, lotCode: 'FC-OLD', leftKg: 40, useBy: '2027-02-14', expired: true },
  ],
} as unknown as FloorCardDto

describe('FloorActionForm, start mixing', () => {
  it('offers the in-date lot first and marks the expired one with its use-by day in the house style', async () => {
    const w = await mountSuspended(FloorActionForm, { props: { kind: 'start_mixing', card, timezone: 'Europe/London' } })
    const select = w.find('select[name="lotId"]')
    expect((select.element as HTMLSelectElement).value).toBe('21')
    const options = select.findAll('option').map(o => o.text())
    expect(options).toEqual(['No lot recorded', 'FC-NEW · 180 kg left', 'FC-OLD · 40 kg left · EXPIRED (use by Sun 14 Feb 2027)'])
    expect(w.find('[data-testid="expired-lot"]').exists()).toBe(false)

    await select.setValue('22')
    expect(w.find('[data-testid="expired-lot"]').text()).toBe('Lot FC-OLD passed its use-by date (Sun 14 Feb 2027): old plaster can set fast or unevenly. Ask the lead before using it.')
    expect(w.text()).not.toContain('2027-02-14')
  })
})

describe('FloorActionForm, a step recorded late', () => {
  it('sends the time typed as an instant in the workshop\'s zone', async () => {
    // a workshop in New York, UTC-5 in winter and UTC-4 in summer time (IANA tz database, rule US)
    const w = await mountSuspended(FloorActionForm, { props: { kind: 'start_mixing', card, timezone: 'America/New_York' } })
    await w.find('[data-testid="recorded-late"]').setValue(true)
    await w.find('input[name="at"]').setValue('07:40')
    await w.find('input[name="waterTempC"]').setValue('18')
    await w.find('form').trigger('submit')
    await expect.poll(() => w.emitted('submit')?.length ?? 0).toBe(1)
    const at = (w.emitted('submit')![0]![0] as { at?: string }).at!
    // today in New York, and of its two possible offsets the one at which its clocks read 07:40
    // (checked through Intl, not the converter under test)
    const ny = (o: Intl.DateTimeFormatOptions) => new Intl.DateTimeFormat('en-GB', { timeZone: 'America/New_York', ...o })
    const [d, m, y] = ny({ day: '2-digit', month: '2-digit', year: 'numeric' }).format(new Date()).split('/').map(Number)
    const expected = [4, 5].map(h => Date.UTC(y!, m! - 1, d!, 7 + h, 40)).find(t => ny({ hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(t) === '07:40')
    expect(expected).toBeDefined()
    expect(Date.parse(at)).toBe(expected)
  })

  it('asks for the time when none is typed, and sends nothing', async () => {
    const w = await mountSuspended(FloorActionForm, { props: { kind: 'start_mixing', card, timezone: 'Europe/London' } })
    await w.find('[data-testid="recorded-late"]').setValue(true)
    await w.find('form').trigger('submit')
    await expect.poll(() => w.text()).toContain('give the time it really happened')
    expect(w.emitted('submit')).toBeUndefined()
  })
})
