// A client's list of deliveries in a Nuxt environment, for a workshop far east of UTC (Auckland,
// UTC+13 in its summer): a delivery day and a fixing day are calendar days and read as
// themselves, in the workshop's day style. (Formatting noon UTC of the day in the workshop's zone
// moved both a day on there.) The routes are mocked; the delivery is our own example.
import { beforeAll, describe, expect, it } from 'vitest'
import { defineComponent, h } from 'vue'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import type { ClientDeliveryDto } from '#shared/types/deliveries'
import DeliveriesClientList from '../../app/components/deliveries/DeliveriesClientList.vue'

registerEndpoint('/api/auth/me', () => ({ workshop: { name: 'Example shop', units: 'metric', timezone: 'Pacific/Auckland', locale: 'en-GB' } }))
const delivery: ClientDeliveryDto = {
  id: 5, deliveryDay: '2027-01-10', fixingOn: '2027-01-11', vehicle: 'Van 2', state: 'booked', site: 'Harbour Street',
  pieces: 3, broken: 0, totalKg: 42, receiverName: null,
} as ClientDeliveryDto
registerEndpoint('/api/client/jobs/9/deliveries', () => [delivery])

// the workshop is read once and shared (as a page's first render has it from the server)
beforeAll(async () => {
  const Workshop = defineComponent({
    async setup() {
      const w = useWorkshopFormat()
      await w.ready
      return () => h('p', w.zone.value)
    },
  })
  expect((await mountSuspended(Workshop)).text()).toBe('Pacific/Auckland')
})

describe('DeliveriesClientList', () => {
  it('writes the delivery and fixing days as the days they are, in a zone far from UTC', async () => {
    const w = await mountSuspended(DeliveriesClientList, { props: { jobId: 9 } })
    const line = w.find('[data-state="booked"]')
    expect(line.find('p').text()).toBe('Sun 10 Jan 2027 · Harbour Street · Booked')
    expect(line.findAll('p')[1]!.text()).toBe('3 pieces on Van 2; fixing from Mon 11 Jan 2027')
  })
})
