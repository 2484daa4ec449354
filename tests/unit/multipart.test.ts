// The multipart parser behind photo uploads: bodies as the browser's FormData encodes them
// (here undici's, through Response), binary data that contains CRLF and dashes, quoted
// boundaries, and malformed or cut-off bodies, which give what was complete and never throw.
import { describe, expect, it } from 'vitest'
import { multipartBoundary, parseMultipart } from '../../server/utils/multipart'

async function encode(form: FormData) {
  const res = new Response(form)
  const type = res.headers.get('content-type')!
  return { type, body: Buffer.from(await res.arrayBuffer()) }
}

/** Bytes that look like delimiters to a careless parser: CRLFs, dashes, a boundary-like run. */
const tricky = Buffer.concat([Buffer.from([0xFF, 0xD8, 0x0D, 0x0A, 0x2D, 0x2D, 0x0D, 0x0A, 0x0D, 0x0A]), Buffer.from('\r\n--not-the-boundary\r\n'), Buffer.alloc(3000, 0x2D)])

describe('parseMultipart', () => {
  it('splits files and fields as FormData sends them, bytes unchanged', async () => {
    const form = new FormData()
    form.append('files', new Blob([tricky], { type: 'image/jpeg' }), 'cornice.jpg')
    form.append('files', new Blob([Buffer.from('second')]), 'rose – centre.png')
    form.append('caption', 'Lengths on the rack, 18.6 m')
    form.append('shared', 'true')
    const { type, body } = await encode(form)
    const parts = parseMultipart(body, multipartBoundary(type)!)
    expect(parts.map(p => [p.name, p.filename])).toEqual([['files', 'cornice.jpg'], ['files', 'rose – centre.png'], ['caption', undefined], ['shared', undefined]])
    expect(Buffer.compare(parts[0]!.data, tricky)).toBe(0)
    expect(parts[0]!.type).toBe('image/jpeg')
    expect(parts[2]!.data.toString('utf8')).toBe('Lengths on the rack, 18.6 m')
  })

  it('keeps an empty file and an empty file name apart from a plain field', () => {
    const body = Buffer.from('--b\r\nContent-Disposition: form-data; name="files"; filename=""\r\n\r\n\r\n--b\r\n'
      + 'Content-Disposition: form-data; name="caption"\r\n\r\n\r\n--b--\r\n')
    expect(parseMultipart(body, 'b')).toEqual([
      { name: 'files', filename: '', type: undefined, data: Buffer.alloc(0) },
      { name: 'caption', filename: undefined, type: undefined, data: Buffer.alloc(0) },
    ])
  })

  it('gives the complete parts of a cut-off or malformed body and never throws', () => {
    const whole = '--b\r\nContent-Disposition: form-data; name="caption"\r\n\r\nfirst\r\n--b\r\nContent-Disposition: form-data; name="files"; filename="a.jpg"\r\n\r\nJPEG'
    expect(parseMultipart(Buffer.from(whole), 'b').map(p => p.name)).toEqual(['caption'])
    for (const junk of ['', 'no boundary here', '--b', '--b\r\n', '--b\r\nContent-Disposition: form-data\r\n\r\nx\r\n--b--', '--b\r\n\r\n\r\n--b--']) {
      expect(parseMultipart(Buffer.from(junk), 'b')).toEqual([])
    }
  })
})

describe('multipartBoundary', () => {
  it('reads a bare or quoted boundary of multipart/form-data only', () => {
    expect(multipartBoundary('multipart/form-data; boundary=----abc123')).toBe('----abc123')
    expect(multipartBoundary('multipart/form-data; charset=utf-8; boundary="a b:c"')).toBe('a b:c')
    expect(multipartBoundary('Multipart/Form-Data;boundary=x')).toBe('x')
    expect(multipartBoundary('application/json')).toBeUndefined()
    expect(multipartBoundary('multipart/form-data')).toBeUndefined()
    expect(multipartBoundary('multipart/form-data; boundary=' + 'x'.repeat(71))).toBeUndefined()
  })
})
