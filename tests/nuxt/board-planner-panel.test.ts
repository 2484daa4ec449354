// The planner's preview panel in a Nuxt environment: each job's line says what the lead can act
// on, days in the workshop's style (its locale from /api/auth/me, mocked): late with its
// projected day; waiting for a mould being made, with the day it is available; and, when some
// pieces cannot be planned at all (a sample awaiting approval), no projected date rather than
// a made-up one. The jobs are our own example.
import { describe, expect, it } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import BoardPlannerPanel from '../../app/components/board/BoardPlannerPanel.vue'

registerEndpoint('/api/auth/me', () => ({ workshop: { name: 'Example shop', units: 'metric', timezone: 'Europe/London', locale: 'en-GB' } }))

const job = { piecesRemaining: 6, readyAt: null, waitsFor: null, note: null }
const props = {
  'items': [{ id: 31, jobCode: 'J-3', description: 'Ceiling centre' }],
  'plannedRange': { from: '2027-03-01', to: '2027-03-12' },
  'proposed': 4,
  'range': { from: '2027-03-01', to: '2027-03-12' },
  'onUpdate:range': () => {},
  'jobs': [
    { ...job, jobId: 1, jobCode: 'J-1', dueOn: '2027-03-05', piecesPlanned: 4, onTime: false, projectedDate: '2027-03-09', readyAt: '2027-03-09T14:30:00Z', waitsFor: { mouldCode: 'CB-14', availableOn: '2027-03-03' } },
    { ...job, jobId: 3, jobCode: 'J-3', dueOn: '2027-03-26', piecesPlanned: 0, onTime: false, projectedDate: null },
  ],
  'unplaced': [{ itemId: 31, reason: 'sample-awaiting-approval', message: 'The job waits for the client to approve its sample cast', pieces: 6 }],
}

describe('BoardPlannerPanel', () => {
  it('says which mould a job waits for and when it is available, in the workshop\'s day style', async () => {
    const w = await mountSuspended(BoardPlannerPanel, { props })
    const late = w.findAll('li')[0]!
    expect(late.text()).toContain('late: due Fri 5 Mar 2027, projected Tue 9 Mar 2027.')
    expect(late.find('[data-testid="plan-waits-for"]').text()).toBe('Waits for mould CB-14, available from Wed 3 Mar 2027.')
    expect(late.find('[data-testid="plan-ready-at"]').text()).toBe('Last piece ready to dispatch about Tue 9 Mar 2027 14:30.')
  })

  it('gives no projected date to a job whose pieces cannot all be planned, and says why below', async () => {
    const w = await mountSuspended(BoardPlannerPanel, { props })
    const items = w.findAll('li')
    expect(items[1]!.text()).toBe('J-3: 0 pieces planned; no projected date yet (due Fri 26 Mar 2027): some of its pieces cannot be planned, see below.')
    expect(items[1]!.text()).not.toMatch(/beyond a year|, projected/)
    expect(items[2]!.text()).toBe('J-3 · Ceiling centre: The job waits for the client to approve its sample cast')
  })
})
