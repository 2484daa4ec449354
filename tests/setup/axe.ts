// axe-core inside a browser journey: evaluates axe's own script in the page and runs it on the
// whole document; a test fails on any serious or critical violation (axe's impact levels),
// naming the rule and the nodes. Moderate and minor findings are returned for the log only.
import { createRequire } from 'node:module'
import { readFileSync } from 'node:fs'
import type { Page } from 'playwright-core'
import type { AxeResults } from 'axe-core'

const source = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')

/** The serious and critical violations on the page (or inside `within`, a CSS selector) as 'rule (impact): targets' lines. */
export async function seriousAxeViolations(page: Page, within?: string): Promise<string[]> {
  // evaluated through the devtools protocol, not as a page script, so the app's CSP stays as it is
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(source)
  const results = await page.evaluate(sel => (window as unknown as { axe: { run: (c: Document | string) => Promise<AxeResults> } }).axe.run(sel ?? document), within)
  return results.violations
    .filter(v => v.impact === 'serious' || v.impact === 'critical')
    .map(v => `${v.id} (${v.impact}): ${v.nodes.map(n => n.target.join(' ')).join(', ')}`)
}
