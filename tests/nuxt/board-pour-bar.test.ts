// One pour bar on the board in a Nuxt environment: a gang mould's bar says how many casts the
// pour makes ("× 4", and "4 casts" in its title and screen-reader text); a one-cavity mould's
// bar carries no count. The pour is our own example (a 08:00–11:00 slot in London).
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import type { PourDto } from '#shared/types/board'
import BoardPourBar from '../../app/components/board/BoardPourBar.vue'

const pour: PourDto = {
  id: 7, version: 1, mouldId: 3, mouldCode: 'RS-12', jobItemId: 11, jobId: 2, jobCode: 'J-2602', itemDescription: 'Ceiling roses',
  casterId: null, casterName: null, gradeId: 1, gradeName: 'Casting plaster', lotId: null, state: 'planned', isSample: false,
  consistency: 70, setFactor: 1, slotStart: '2027-03-01T08:00:00.000Z', slotEnd: '2027-03-01T11:00:00.000Z',
  mixAt: '2027-03-01T08:15:00.000Z', demouldOpenAt: '2027-03-01T09:00:00.000Z', demouldCloseAt: '2027-03-01T10:30:00.000Z',
  plasterKg: 6.4, waterKg: 4.5, warnings: [], overdue: false, situation: 'waiting',
}
const props = { pour, timezone: 'Europe/London', now: Date.parse('2027-02-28T12:00:00Z') }

describe('BoardPourBar', () => {
  it('shows a gang mould\'s casts as × N, in the text a screen reader hears too', async () => {
    const w = await mountSuspended(BoardPourBar, { props: { ...props, cavities: 4 } })
    expect(w.find('[data-testid="pour-cavities"]').text()).toBe('× 4')
    expect(w.find('.sr-only').text()).toContain('Ceiling roses · 4 casts · planned')
    expect(w.find('[data-testid="pour-bar"]').attributes('title')).toContain('4 casts')
  })

  it('carries no count for a one-cavity mould, nor when the count is missing', async () => {
    for (const cavities of [1, undefined]) {
      const w = await mountSuspended(BoardPourBar, { props: { ...props, cavities } })
      expect(w.find('[data-testid="pour-cavities"]').exists()).toBe(false)
      expect(w.find('.sr-only').text()).toContain('Ceiling roses · planned')
    }
  })
})
