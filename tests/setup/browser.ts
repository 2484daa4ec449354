// Debian's chromium driven by playwright-core, with the flags this closed machine needs. Inside
// the e2e project every file connects to the run's one chromium (tests/setup/chromium-server.ts)
// and opens contexts in it; elsewhere (the benchmarks) openBrowser launches a chromium of its own.
import { chromium, type Browser, type BrowserContext, type Download, type Page } from 'playwright-core'
import { mkdirSync } from 'node:fs'
import { join, resolve } from 'node:path'

declare module 'vitest' {
  export interface ProvidedContext { chromiumEndpoint: string }
}

export const SCREENSHOTS = resolve(import.meta.dirname, '../../test-output/screenshots')

export const VIEWPORTS = {
  desktop: { width: 1366, height: 860 },
  tablet: { width: 820, height: 1180 },
  phone: { width: 390, height: 844 },
}

/**
 * Every page of a browser opened here reports Content Security Policy violations (the
 * `securitypolicyviolation` event, W3C CSP Level 3 §5.3) to the console, where they are
 * collected with chromium's own "Refused to …" messages; `close()` fails the journey when
 * there was any, so each journey also proves the app runs under its policy.
 */
const REPORT_CSP = `document.addEventListener('securitypolicyviolation', e => console.error('CSP violation: ' + e.violatedDirective + ' blocked ' + (e.blockedURI || 'inline') + ' at ' + e.sourceFile + ':' + e.lineNumber))`

const LAUNCH = {
  executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  headless: true,
  args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
    '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage'],
}

/** The run's shared chromium (the e2e project's globalSetup), reached over its WebSocket endpoint. */
export const launchChromiumServer = () => chromium.launchServer(LAUNCH)

/** The endpoint of the run's chromium when this file runs in the e2e project, else undefined. */
async function sharedEndpoint(): Promise<string | undefined> {
  if (!process.env.VITEST) return undefined
  const { inject } = await import('vitest')
  return inject('chromiumEndpoint') as string | undefined
}

/**
 * A fresh browser context (its own cookies, storage, offline switch) with `viewport`: in the
 * run's shared chromium when there is one, else in a chromium launched for it. `close()` ends
 * the context and this file's connection (or its own chromium), never the shared one.
 * In the browser tests the shop staff's service worker is blocked unless a file asks for it
 * (`serviceWorkers: 'allow'`, the offline journeys): installed, it fetches the app's ~120 files
 * into its cache in every fresh context, about 2 CPU-s of chromium's each time, for journeys that
 * never go offline. A chromium launched here (the benchmarks) keeps it, as a tablet does.
 */
export async function openBrowser(viewport = VIEWPORTS.desktop, opts: { serviceWorkers?: 'allow' | 'block' } = {}) {
  const endpoint = await sharedEndpoint()
  const browser: Browser = endpoint ? await chromium.connect(endpoint) : await chromium.launch(LAUNCH)
  const context: BrowserContext = await browser.newContext({ viewport, serviceWorkers: opts.serviceWorkers ?? (endpoint ? 'block' : 'allow') })
  const cspViolations: string[] = []
  await context.addInitScript(REPORT_CSP)
  context.on('console', (msg) => {
    const text = msg.text()
    if (msg.type() === 'error' && (text.startsWith('CSP violation:') || /Content Security Policy/.test(text))) cspViolations.push(`${msg.page()?.url() ?? ''}: ${text}`)
  })
  return {
    context,
    cspViolations,
    async close() {
      await context.close()
      await browser.close()
      if (cspViolations.length) throw new Error(`Content Security Policy violations:\n${cspViolations.join('\n')}`)
    },
  }
}

/** A download's text: read through the connection, since the run's shared chromium keeps the file on its side. */
export async function downloadText(download: Download): Promise<string> {
  const chunks: Buffer[] = []
  for await (const chunk of await download.createReadStream()) chunks.push(chunk as Buffer)
  return Buffer.concat(chunks).toString('utf8')
}

export async function screenshot(page: Page, name: string) {
  mkdirSync(SCREENSHOTS, { recursive: true })
  await page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage: true })
}

/**
 * Opens a page and waits until Vue has taken over its server-rendered HTML (html[data-hydrated],
 * set by app.vue): a click before then meets a button with no handler yet, and on a loaded
 * machine the page's load event comes well before hydration (a full run lost a click on the lead's
 * job page that way, and the same journey failed 2 of 3 times alone beside five busy loops).
 */
export async function gotoHydrated(page: Page, url: string) {
  await page.goto(url)
  await page.locator('html[data-hydrated]').waitFor()
}

/** Fills and submits the sign-in form without waiting for where it lands (a refusal stays on /login). */
export async function submitSignIn(page: Page, base: string, email: string, password: string) {
  await page.goto(`${base}/login`)
  await page.locator('html[data-hydrated]').waitFor()
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/**
 * Signs in through the form as a real user would: waits for hydration first (a click before
 * it would submit the form natively), then for the page to leave /login (or reach `home`).
 */
export async function signInThroughForm(page: Page, base: string, email: string, password: string, home?: string) {
  await submitSignIn(page, base, email, password)
  if (home) await page.waitForURL(`${base}${home}`)
  else await page.waitForURL(u => !u.pathname.startsWith('/login'))
}

/**
 * The camera this page gets: a canvas showing `png` (a data: URL, e.g. a screenshot of a label's
 * QR code as the print view rendered it), repainted so the stream keeps sending frames. The run's
 * one chromium is shared by every browser file and launched once, so its fake-camera flags
 * (--use-file-for-fake-video-capture) cannot carry a test's own picture; the scanner's own path
 * (video → canvas → jsQR) still reads it, nothing of the decoding is skipped. Call before the
 * page's first navigation.
 */
export async function fakeCamera(page: Page, png: string) {
  await page.addInitScript((src: string) => {
    const getUserMedia = async () => {
      const img = new Image()
      img.src = src
      await img.decode()
      const canvas = document.createElement('canvas')
      canvas.width = 640
      canvas.height = 480
      const ctx = canvas.getContext('2d')!
      const draw = () => {
        ctx.fillStyle = '#fff'
        ctx.fillRect(0, 0, 640, 480)
        ctx.drawImage(img, 140, 60, 360, 360)
      }
      draw()
      setInterval(draw, 100)
      return canvas.captureStream(10)
    }
    Object.defineProperty(navigator, 'mediaDevices', { configurable: true, value: { getUserMedia } })
  }, png)
}

/** Draws a zigzag across a signature pad (the element with `testId`) with the mouse, as a finger would. */
export async function drawSignature(page: Page, testId: string) {
  const pad = (await page.getByTestId(testId).boundingBox())!
  await page.mouse.move(pad.x + 30, pad.y + pad.height / 2)
  await page.mouse.down()
  for (let i = 1; i <= 12; i++) await page.mouse.move(pad.x + 30 + i * 25, pad.y + pad.height / 2 + (i % 2 ? -30 : 30), { steps: 3 })
  await page.mouse.up()
}
