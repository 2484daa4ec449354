// QR codes as SVG, made on the server with node-qrcode (qrcode 1.5, MIT): error correction M
// (about 15 % of the code may be lost to a scuff or a smear of plaster and it still reads;
// ISO/IEC 18004 levels L 7 %, M 15 %, Q 25 %, H 30 %), and the four-module quiet zone the
// standard asks for around the code.
// Imported with the first code rather than at server start (its import costs about 50 ms of CPU).

export async function qrSvg(text: string): Promise<string> {
  const { toString } = await import('qrcode')
  return toString(text, { type: 'svg', errorCorrectionLevel: 'M', margin: 4, color: { dark: '#000000', light: '#ffffff' } })
}
