// The quote journeys' shared steps in the browser (tests/e2e/quotes.test.ts prices them by
// hand; tests/e2e/enquiry-to-paid.test.ts carries them on to the invoice): the rates typed as
// money, and the drawing room's take-off (walls 5.0 m and 3.1 m, 9 kg per length, a new mould).
import type { Page } from 'playwright-core'

/** On /lead/quotes: the journey's rates, saved. */
export async function saveJourneyRates(lead: Page) {
  await lead.getByRole('button', { name: 'Rates' }).click()
  const rates: [string, string][] = [['Plaster, per bag', '18.50'], ['A new mould', '420'], ['Casting, per length', '35'], ['Casting, per piece', '28'],
    ['Fettling, per piece', '9'], ['Fixing on site, per metre', '12.50'], ['Delivery, per trip', '60']]
  for (const [label, value] of rates) await lead.getByLabel(label).fill(value)
  await lead.getByLabel('Margin').fill('15')
  await lead.getByLabel('Tax').fill('20')
  await lead.getByLabel('Deposit asked').fill('30')
  await lead.getByRole('button', { name: 'Save rates' }).click()
  await lead.getByText(/Rates saved/).waitFor()
}

/** On /lead/quotes: a new quote for the demo's first client with the drawing room's take-off, not yet priced. */
export async function fillDrawingRoomTakeOff(lead: Page, title: string) {
  await lead.getByRole('button', { name: 'New quote' }).click()
  await lead.getByLabel('Title').fill(title)
  await lead.getByLabel('Client').selectOption({ label: 'Hollin Row Architects' })
  await lead.getByLabel('Room', { exact: true }).fill('Drawing room')
  await lead.getByLabel('Run profile').fill('Egg-and-dart 150')
  await lead.getByLabel('Walls').fill('5.0, 3.1')
  await lead.getByLabel('Spares').fill('0')
  await lead.getByLabel('Plaster per length').fill('9')
  await lead.getByLabel('Needs a new mould').check()
}
