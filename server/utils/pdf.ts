// Server-made PDFs (quotes now; invoices, delivery notes and the fixer's pack later) through
// PDFKit, a well-kept PDF library. One look for every document: the workshop's name on top in
// Setline's kiln colour, plaster-line rules, the built-in Helvetica (its WinAnsi encoding covers
// £, €, ° and the accents a British or European workshop writes), A4 with 20 mm margins.
// PDFKit is imported with the first document, not when the server starts: importing it costs
// about 0.3 s of CPU (measured on this project's 2-core machine), and most starts print nothing.

export const PDF_COLOURS = { ink: '#2F2B27', muted: '#5E574F', line: '#D6CFC2', kiln: '#A6452B' } as const
const MM = 72 / 25.4

export type Pdf = PDFKit.PDFDocument

/** Builds a PDF in memory; `draw` writes the pages. */
export async function renderPdf(meta: { title: string; author: string }, draw: (doc: Pdf) => void): Promise<Buffer> {
  const PDFDocument = (await import('pdfkit')).default
  const doc = new PDFDocument({ size: 'A4', margin: 20 * MM, info: { Title: meta.title, Author: meta.author, Creator: 'Setline' } })
  const chunks: Buffer[] = []
  return new Promise((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
    try {
      draw(doc)
      doc.end()
    }
    catch (e) {
      reject(e)
    }
  })
}

/** The workshop's name, the document's title and a rule beneath. */
export function pdfHeader(doc: Pdf, workshop: string, title: string, subtitle?: string) {
  doc.fillColor(PDF_COLOURS.kiln).font('Helvetica-Bold').fontSize(16).text(workshop)
  doc.moveDown(0.3).fillColor(PDF_COLOURS.ink).fontSize(13).text(title)
  if (subtitle) doc.font('Helvetica').fontSize(10).fillColor(PDF_COLOURS.muted).text(subtitle)
  pdfRule(doc)
}

export function pdfRule(doc: Pdf) {
  const y = doc.y + 6
  doc.moveTo(doc.page.margins.left, y).lineTo(doc.page.width - doc.page.margins.right, y).lineWidth(0.75).strokeColor(PDF_COLOURS.line).stroke()
  doc.y = y + 8
}

export interface PdfColumn { label: string; width: number; align?: 'left' | 'right' }

/** A table: a header row, then the rows, a new page (with the header again) when one is full. */
export function pdfTable(doc: Pdf, columns: PdfColumn[], rows: string[][]) {
  const left = doc.page.margins.left
  const usable = doc.page.width - left - doc.page.margins.right
  const total = columns.reduce((a, c) => a + c.width, 0)
  const widths = columns.map(c => (c.width / total) * usable)
  const row = (cells: string[], bold: boolean) => {
    doc.font(bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(10).fillColor(PDF_COLOURS.ink)
    const height = Math.max(...cells.map((c, i) => doc.heightOfString(c, { width: widths[i]! - 6 }))) + 6
    if (doc.y + height > doc.page.height - doc.page.margins.bottom) {
      doc.addPage()
      if (!bold) row(columns.map(c => c.label), true)
    }
    const y = doc.y
    let x = left
    cells.forEach((c, i) => {
      doc.text(c, x + 3, y + 3, { width: widths[i]! - 6, align: columns[i]!.align ?? 'left' })
      x += widths[i]!
    })
    doc.y = y + height
    doc.moveTo(left, doc.y).lineTo(left + usable, doc.y).lineWidth(0.5).strokeColor(PDF_COLOURS.line).stroke()
  }
  row(columns.map(c => c.label), true)
  for (const r of rows) row(r, false)
  doc.x = left
}
