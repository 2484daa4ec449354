// The text of a PDF, page by page, through pdf.js (Mozilla's PDF reader) for tests that check
// what a generated document says.
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs'

export async function pdfText(bytes: ArrayBuffer | Uint8Array): Promise<string[]> {
  const data = bytes instanceof Uint8Array ? new Uint8Array(bytes) : new Uint8Array(bytes)
  const doc = await getDocument({ data, useSystemFonts: false, isEvalSupported: false, verbosity: 0 }).promise
  const pages: string[] = []
  for (let n = 1; n <= doc.numPages; n++) {
    const content = await (await doc.getPage(n)).getTextContent()
    pages.push(content.items.map(i => ('str' in i ? i.str : '')).join(' ').replace(/\s+/g, ' '))
  }
  await doc.destroy()
  return pages
}
