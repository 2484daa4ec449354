// Component tests of forms that carry rules, in a Nuxt environment: the shared zod schema's
// problem shows beside its field and nothing is sent while the form is invalid; a valid form
// sends the body the route's schema expects (the routes are mocked with registerEndpoint).
import { beforeEach, describe, expect, it } from 'vitest'
import { flushPromises } from '@vue/test-utils'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import { readBody } from 'h3'
import type { Bench, Grade, Mould } from '#shared/types/catalogue'
import CatalogueLotForm from '../../app/components/catalogue/CatalogueLotForm.vue'
import CatalogueMouldForm from '../../app/components/catalogue/CatalogueMouldForm.vue'
import TabletPinForm from '../../app/components/tablet/TabletPinForm.vue'
import JobsItemForm from '../../app/components/jobs/JobsItemForm.vue'

/** The bodies each mocked route received, by method and path. */
const sent: { method: string; path: string; body: unknown }[] = []
function record(path: string, method: 'POST' | 'PUT' | 'PATCH', answer: unknown) {
  registerEndpoint(path, {
    method,
    handler: async (event) => {
      sent.push({ method, path, body: await readBody(event) })
      return answer
    },
  })
}
beforeEach(() => {
  sent.length = 0
})

type Wrapper = Awaited<ReturnType<typeof mountSuspended>>
/** Submits; what the form does next with the mocked answer is awaited by polling. */
async function submit(w: Wrapper) {
  await w.find('form').trigger('submit')
  await flushPromises()
}
const errorOf = (w: Wrapper, id: string) => w.find(`#${id}-error`).exists() ? w.find(`#${id}-error`).text().replace('✕ ', '') : ''

describe('CatalogueLotForm', () => {
  const grades = [{ id: 3, name: 'Fine casting (beta)', bagKg: 25, archivedAt: null }] as unknown as Grade[]
  record('/api/lots', 'POST', { id: 1 })

  it('shows the schema\'s problems beside the fields and sends nothing', async () => {
    const w = await mountSuspended(CatalogueLotForm, { props: { grades } })
    await w.find('#lot-bags').setValue('0')
    await w.find('#lot-received').setValue('2026-03-10')
    await w.find('#lot-useby').setValue('2026-03-01')
    await submit(w)
    expect(errorOf(w, 'lot-code')).toBe('Lot code is required')
    expect(errorOf(w, 'lot-bags')).toBe('Bags received must be between 1 and 10000 bags')
    expect(errorOf(w, 'lot-useby')).toBe('Use by must not be before Received on')
    expect(w.find('[role="alert"].notice-error').text()).toBe('Please correct the fields marked below.')
    expect(sent).toEqual([])
    expect(w.emitted('saved')).toBeUndefined()
  })

  it('sends a new delivery with the grade\'s bag mass and numbers as numbers', async () => {
    const w = await mountSuspended(CatalogueLotForm, { props: { grades } })
    await w.find('#lot-code').setValue('L-2026/07')
    await w.find('#lot-bags').setValue('12')
    await w.find('#lot-received').setValue('2026-03-10')
    await submit(w)
    await expect.poll(() => w.emitted('saved')?.length).toBe(1)
    expect(sent).toEqual([{ method: 'POST', path: '/api/lots', body: expect.objectContaining({ gradeId: 3, lotCode: 'L-2026/07', bagsReceived: 12, bagKg: 25, receivedOn: '2026-03-10', useBy: null }) }])
  })
})

describe('CatalogueLotForm price per bag', () => {
  const grades = [{ id: 3, name: 'Fine casting (beta)', bagKg: 25, archivedAt: null }] as unknown as Grade[]

  it('sends the price typed as money in whole pence and refuses a third decimal', async () => {
    const w = await mountSuspended(CatalogueLotForm, { props: { grades, currency: 'GBP' } })
    await w.find('#lot-code').setValue('L-2026/08')
    await w.find('#lot-bags').setValue('12')
    await w.find('#lot-received').setValue('2026-03-10')
    await w.find('#lot-price').setValue('18.505')
    await submit(w)
    expect(errorOf(w, 'lot-price')).toBe('Price per bag has more than 2 decimal places')
    expect(sent).toEqual([])
    await w.find('#lot-price').setValue('18.50')
    await submit(w)
    await expect.poll(() => w.emitted('saved')?.length).toBe(1)
    expect(sent).toEqual([{ method: 'POST', path: '/api/lots', body: expect.objectContaining({ lotCode: 'L-2026/08', pricePerBag: 1850 }) }])
  })
})

describe('CatalogueMouldForm', () => {
  const benches = [{ id: 4, name: 'North bench', archivedAt: null }] as unknown as Bench[]
  record('/api/moulds', 'POST', { id: 41 })

  it('shows the schema\'s problems beside the fields and sends nothing', async () => {
    const w = await mountSuspended(CatalogueMouldForm, { props: { benches } })
    await w.find('#m-code').setValue('CB 12!')
    await w.find('#m-casts').setValue('Scroll corbel')
    await w.find('#m-cavityLitres').setValue('0')
    await w.find('#m-prepMinutes').setValue('2.5')
    await submit(w)
    expect(errorOf(w, 'm-code')).toBe('code may use letters, digits, spaces and . - / _')
    expect(errorOf(w, 'm-cavityLitres')).toBe('Cavity must be greater than 0 and at most 1000 L')
    expect(errorOf(w, 'm-prepMinutes')).toBe('Preparation time must be a whole number')
    expect(errorOf(w, 'm-casts')).toBe('')
    expect(sent).toEqual([])
  })

  it('sends a new mould with empty optional numbers as null', async () => {
    const w = await mountSuspended(CatalogueMouldForm, { props: { benches } })
    await w.find('#m-code').setValue('CB-12')
    await w.find('#m-casts').setValue('Scroll corbel')
    await w.find('#m-bench').setValue('4')
    await w.find('#m-cavityLitres').setValue('1.8')
    await submit(w)
    await expect.poll(() => w.emitted('saved')).toEqual([[41]])
    expect(sent).toEqual([{ method: 'POST', path: '/api/moulds', body: expect.objectContaining({
      code: 'CB-12', casts: 'Scroll corbel', material: 'silicone', benchId: 4, cavityLitres: 1.8, castLengthM: null,
      prepMinutes: 10, cleanMinutes: 10, maxDwellMinutes: 120, pulls: 0, expectedPulls: null,
    }) }])
  })
})

describe('JobsItemForm', () => {
  const moulds = [{ id: 7, code: 'CR-3', casts: 'Cornice run', state: 'ready', castLengthM: 1.2, cavityLitres: 3 }] as unknown as Mould[]
  record('/api/jobs/5/items', 'POST', { id: 51 })

  it('asks for the quantity and for a mould or a profile, and sends nothing', async () => {
    const w = await mountSuspended(JobsItemForm, { props: { jobId: 5, moulds, grades: [] } })
    await w.find('#item-desc').setValue('Scroll corbels')
    await submit(w)
    expect(errorOf(w, 'item-qty')).toBe('quantity is required for an item in pieces')
    expect(errorOf(w, 'item-mould')).toBe('choose a mould or name a profile')
    expect(sent).toEqual([])
  })

  it('shows a wall\'s problem beside that wall in a run', async () => {
    const w = await mountSuspended(JobsItemForm, { props: { jobId: 5, moulds, grades: [] } })
    await w.find('input[type="radio"][value="run"]').setValue(true)
    await w.find('#item-desc').setValue('Dining room cornice')
    await w.find('#item-mould').setValue('7')
    await w.find('#wall-0').setValue('-2')
    await submit(w)
    expect(errorOf(w, 'wall-0')).toMatch(/^lengthM must be greater than 0/)
    expect(sent).toEqual([])
  })

  it('passes corners to the run calculator, shows the cut list and sends them', async () => {
    const w = await mountSuspended(JobsItemForm, { props: { jobId: 5, moulds, grades: [] } })
    await w.find('input[type="radio"][value="run"]').setValue(true)
    await w.find('#item-desc').setValue('Bay cornice')
    await w.find('#item-mould').setValue('7')
    await w.find('#wall-0').setValue('2')
    await w.find('#wall-0-start').setValue('external')
    await w.find('#wall-0-end').setValue('internal')
    await w.find('#item-projection').setValue('0.15')
    await flushPromises()
    // by hand (plaster-cutlist.ts header): an external mitre adds the 0.15 m projection, an
    // internal corner without a block adds nothing: a 2.15 m run, cut 1.2 + 0.95 from 1.2 m lengths
    const row = w.find('[data-testid="cut-list"] tbody tr')
    expect(row.find('td').text()).toBe('2.15 m')
    expect(row.findAll('td')[1]!.text()).toMatch(/^1\.20 \(1\) \+ 0\.95 \(2\) m/)
    await submit(w)
    await expect.poll(() => w.emitted('saved')?.length).toBe(1)
    expect(sent).toEqual([{ method: 'POST', path: '/api/jobs/5/items', body: expect.objectContaining({
      kind: 'run', mouldId: 7, walls: [{ lengthM: 2, start: 'external', end: 'internal' }], projectionM: 0.15, sawCutM: null, cornerBlockLegM: null,
    }) }])
  })

  it('sends an item in pieces by its profile', async () => {
    const w = await mountSuspended(JobsItemForm, { props: { jobId: 5, moulds, grades: [] } })
    await w.find('#item-desc').setValue('Scroll corbels')
    await w.find('#item-profile').setValue('Egg and dart')
    await w.find('#item-qty').setValue('12')
    await submit(w)
    await expect.poll(() => w.emitted('saved')?.length).toBe(1)
    expect(sent).toEqual([{ method: 'POST', path: '/api/jobs/5/items', body: expect.objectContaining({
      kind: 'pieces', mouldId: null, profile: 'Egg and dart', description: 'Scroll corbels', quantity: 12, walls: null, gradeId: null, consistency: null,
    }) }])
  })
})

describe('TabletPinForm', () => {
  registerEndpoint('/api/me/pin', { method: 'GET', handler: () => ({ hasPin: false }) })
  record('/api/me/pin', 'PUT', { ok: true })

  it('refuses an easy PIN beside the field and sends nothing', async () => {
    const w = await mountSuspended(TabletPinForm)
    await w.find('#pin-new').setValue('1111')
    await w.find('#pin-repeat').setValue('1111')
    await w.find('#pin-password').setValue('my password')
    await submit(w)
    expect(errorOf(w, 'pin-new')).toBe('pin must not be one digit repeated')
    expect(sent).toEqual([])
  })

  it('refuses two PINs that differ and a missing password', async () => {
    const w = await mountSuspended(TabletPinForm)
    await w.find('#pin-new').setValue('2580')
    await w.find('#pin-repeat').setValue('2581')
    await submit(w)
    expect(errorOf(w, 'pin-password')).toBe('password is required')
    await w.find('#pin-password').setValue('my password')
    await submit(w)
    expect(errorOf(w, 'pin-repeat')).toBe('The two PINs differ')
    expect(sent).toEqual([])
  })

  it('sends the PIN with the password, not the repeat', async () => {
    const w = await mountSuspended(TabletPinForm)
    await w.find('#pin-new').setValue('2580')
    await w.find('#pin-repeat').setValue('2580')
    await w.find('#pin-password').setValue('my password')
    await submit(w)
    await expect.poll(() => w.find('[role="status"]').exists() && w.find('[role="status"]').text()).toMatch(/^PIN set/)
    expect(sent).toEqual([{ method: 'PUT', path: '/api/me/pin', body: { pin: '2580', password: 'my password' } }])
  })
})
