// What goes over the wire: the built assets precompressed (nuxt.config.ts compressPublicAssets)
// and the pages and JSON answers compressed per request (server/plugins/compression.ts), each in
// the coding the request accepts, decoding to exactly the bytes of the identity answer; a request
// without Accept-Encoding, or one refusing every coding, gets identity; small answers go as they
// are. Requests go through node:http, because fetch adds Accept-Encoding and decodes by itself.
import { readdirSync, readFileSync, statSync } from 'node:fs'
import { request } from 'node:http'
import { join, resolve } from 'node:path'
import { brotliDecompressSync, gunzipSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { MIN_COMPRESS_BYTES } from '../../server/utils/compression'

interface Raw { status: number; headers: Record<string, string | string[] | undefined>; body: Buffer }

function get(path: string, headers: Record<string, string> = {}): Promise<Raw> {
  const url = new URL(baseUrl() + path)
  return new Promise((resolve, reject) => {
    request({ host: url.hostname, port: url.port, path: url.pathname + url.search, headers }, (res) => {
      const chunks: Buffer[] = []
      res.on('data', (d: Buffer) => chunks.push(d))
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }))
      res.on('error', reject)
    }).on('error', reject).end()
  })
}

function decode(r: Raw): Buffer {
  const coding = r.headers['content-encoding']
  if (coding === 'br') return brotliDecompressSync(r.body)
  if (coding === 'gzip') return gunzipSync(r.body)
  if (coding === undefined) return r.body
  throw new Error(`unexpected Content-Encoding ${String(coding)}`)
}

const vary = (r: Raw) => String(r.headers.vary ?? '').toLowerCase()

const assets = resolve(import.meta.dirname, '../../', process.env.SETLINE_BUILD_DIR ?? '.output', 'public/_nuxt')
/** The largest script of the build: the one a slow network feels most. */
const bigScript = readdirSync(assets).filter(f => f.endsWith('.js'))
  .sort((a, b) => statSync(join(assets, b)).size - statSync(join(assets, a)).size)[0]!

let lead = ''
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
})
afterAll(closeTestDb)

describe('static assets', () => {
  it('the sign-in page preloads the regular body font, and that file is served as a cached woff2', async () => {
    const page = decode(await get('/login', { 'accept-encoding': 'identity' })).toString('utf8')
    const link = /<link[^>]*rel="preload"[^>]*>/g
    const font = [...page.matchAll(link)].map(m => m[0]).find(l => l.includes('as="font"'))
    expect(font, 'a font preload link').toBeTruthy()
    expect(font).toContain('type="font/woff2"')
    expect(font).toContain('crossorigin')
    const href = /href="([^"]+)"/.exec(font!)![1]!
    expect(href).toMatch(/latin-400-normal.*\.woff2$/)
    const r = await get(href)
    expect(r.status).toBe(200)
    expect(String(r.headers['content-type'])).toContain('font/woff2')
    expect(r.headers['cache-control']).toContain('immutable')
    // a woff2 file starts with its signature 'wOF2' (W3C WOFF 2.0, section 3)
    expect(r.body.subarray(0, 4).toString('latin1')).toBe('wOF2')
  })

  const original = readFileSync(join(assets, bigScript))

  it.each(['br', 'gzip'] as const)('go out precompressed as %s, decode to the file, and stay cached as immutable', async (coding) => {
    const r = await get(`/_nuxt/${bigScript}`, { 'accept-encoding': coding })
    expect(r.status).toBe(200)
    expect(r.headers['content-encoding']).toBe(coding)
    expect(vary(r)).toContain('accept-encoding')
    expect(String(r.headers['content-type'])).toContain('javascript')
    expect(r.headers['cache-control']).toContain('immutable')
    expect(r.body.length).toBeLessThan(original.length / 2)
    expect(decode(r).equals(original)).toBe(true)
  })

  it('prefer brotli when the browser offers both, as browsers do', async () => {
    const r = await get(`/_nuxt/${bigScript}`, { 'accept-encoding': 'gzip, deflate, br, zstd' })
    expect(r.headers['content-encoding']).toBe('br')
    expect(decode(r).equals(original)).toBe(true)
  })

  it('go out as they are without Accept-Encoding', async () => {
    const r = await get(`/_nuxt/${bigScript}`)
    expect(r.headers['content-encoding']).toBeUndefined()
    expect(r.body.equals(original)).toBe(true)
  })
})

describe('pages and JSON answers', () => {
  // the lead's board over four weeks around today (a month is its longest range): the demo's pours make it tens of KB of JSON
  const today = new Date()
  const day = (offset: number) => new Date(today.getTime() + offset * 86_400_000).toISOString().slice(0, 10)
  const board = `/api/board?from=${day(-14)}&to=${day(13)}`

  it.each(['br', 'gzip'] as const)('a large JSON answer is compressed as %s and decodes to the identity answer', async (coding) => {
    const plain = await get(board, { cookie: lead, accept: 'application/json' })
    expect(plain.status).toBe(200)
    expect(plain.headers['content-encoding']).toBeUndefined()
    expect(plain.body.length).toBeGreaterThan(MIN_COMPRESS_BYTES)
    expect(vary(plain)).toContain('accept-encoding')
    const packed = await get(board, { 'cookie': lead, 'accept': 'application/json', 'accept-encoding': coding })
    expect(packed.status).toBe(200)
    expect(packed.headers['content-encoding']).toBe(coding)
    expect(String(packed.headers['content-type'])).toContain('application/json')
    expect(packed.headers['content-length'] === undefined || Number(packed.headers['content-length']) === packed.body.length).toBe(true)
    expect(packed.body.length).toBeLessThan(plain.body.length)
    // the same board, read twice: only the server's clock stamp (`now`) may differ between them
    const { now: _a, ...unpacked } = JSON.parse(decode(packed).toString('utf8'))
    const { now: _b, ...identity } = JSON.parse(plain.body.toString('utf8'))
    expect(unpacked).toEqual(identity)
  })

  it('a rendered page is compressed and keeps its security policy', async () => {
    const r = await get('/login', { 'accept-encoding': 'gzip' })
    expect(r.status).toBe(200)
    expect(r.headers['content-encoding']).toBe('gzip')
    expect(r.headers['content-security-policy']).toBeTruthy()
    expect(decode(r).toString('utf8')).toContain('<html')
  })

  it('a request that refuses every coding, or names none, gets identity', async () => {
    for (const accept of ['identity', 'br;q=0, gzip;q=0', '*;q=0']) {
      const r = await get(board, { 'cookie': lead, 'accept': 'application/json', 'accept-encoding': accept })
      expect(r.headers['content-encoding'], accept).toBeUndefined()
      expect(() => JSON.parse(r.body.toString('utf8'))).not.toThrow()
    }
  })

  it('a small answer goes as it is', async () => {
    const r = await get('/api/health', { 'accept-encoding': 'br, gzip' })
    expect(r.status).toBe(200)
    expect(r.body.length).toBeLessThan(MIN_COMPRESS_BYTES)
    expect(r.headers['content-encoding']).toBeUndefined()
  })
})
