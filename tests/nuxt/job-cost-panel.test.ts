// The lead's "Cost against estimate" panel in a Nuxt environment: the figures table beneath the
// chart shows each item's parts, actual, estimate and difference as money, "no estimate" where
// there is none, and the chart draws one segment per part of the cost with its estimate marked.
// The route is mocked with registerEndpoint; the figures are our own example (the panel formats,
// it does not compute: 215 + 2250 + 1250 + 7500 = 11215 p, 11215 − 10000 = 1215 p over).
import { describe, expect, it } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import type { JobCostDto } from '#shared/types/job-cost'
import JobsCostPanel from '../../app/components/jobs/JobsCostPanel.vue'

const dto: JobCostDto = {
  jobId: 5, jobCode: 'J-5', currency: 'GBP', labourPerHour: 3000, asOf: '2026-12-07T15:00:00.000Z',
  items: [
    { itemId: 1, description: 'Cornice run', plaster: 215, casting: 2250, fettling: 1250, repair: 0, mouldMaking: 7500, total: 11215, estimate: 10000, difference: 1215 },
    { itemId: 2, description: 'Ceiling rose', plaster: 215, casting: 2250, fettling: 0, repair: 1500, mouldMaking: 0, total: 3965, estimate: null, difference: null },
  ],
  total: { plaster: 430, casting: 4500, fettling: 1250, repair: 1500, mouldMaking: 7500, total: 15180, estimate: 15000, difference: 180 },
  quote: { number: 12, revision: 2 },
  people: [{ personId: 9, name: 'Example Caster', castingMinutes: 90, fettlingMinutes: 0, repairMinutes: 0, mouldHours: 0 }],
  unpricedPours: 0,
  running: 0,
}
registerEndpoint('/api/jobs/5/cost', () => dto)

describe('JobsCostPanel', () => {
  it('puts the chart\'s figures in a table beneath it', async () => {
    const w = await mountSuspended(JobsCostPanel, { props: { jobId: 5 } })
    const cells = (sel: string) => w.find(sel).findAll('th, td').map(c => c.text())
    expect(cells('[data-item-id="1"]')).toEqual(['Cornice run', '£2.15', '£22.50', '£12.50', '£0.00', '£75.00', '£112.15', '£100.00', '£12.15 over'])
    expect(cells('[data-item-id="2"]')).toEqual(['Ceiling rose', '£2.15', '£22.50', '£0.00', '£15.00', '£0.00', '£39.65', 'no estimate', '—'])
    expect(cells('[data-testid="job-cost-total"]')).toEqual(['Total', '£4.30', '£45.00', '£12.50', '£15.00', '£75.00', '£151.80', '£150.00', '£1.80 over'])
    expect(w.find('[data-testid="job-cost-summary"]').text()).toContain('Q-0012 revision 2')

    const chart = w.find('[data-testid="job-cost-chart"]')
    expect(chart.attributes('role')).toBe('img')
    expect(chart.attributes('aria-label')).toContain('Cornice run: £112.15 against £100.00')
    // the widest bar (112.15) spans the chart: its parts add up to 100
    const parts = chart.findAll('g')[0]!.findAll('rect')
    expect(parts.map(r => r.attributes('data-kind'))).toEqual(['plaster', 'casting', 'fettling', 'mouldMaking'])
    expect(parts.reduce((s, r) => s + Number(r.attributes('width')), 0)).toBeCloseTo(100, 6)
    expect(chart.findAll('g')[1]!.findAll('line')).toHaveLength(0)
  })

  it('says "no estimate" for a job without an accepted quote', async () => {
    registerEndpoint('/api/jobs/6/cost', () => ({ ...dto, jobId: 6, quote: null, total: { ...dto.total, estimate: null, difference: null } }))
    const w = await mountSuspended(JobsCostPanel, { props: { jobId: 6 } })
    expect(w.find('[data-testid="job-cost-no-estimate"]').text()).toContain('No estimate')
  })
})
