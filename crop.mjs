import sharp from 'sharp'
const [f, top, h, out] = process.argv.slice(2)
const meta = await sharp(f).metadata()
await sharp(f).extract({ left: 0, top: Number(top), width: meta.width, height: Math.min(Number(h), meta.height - Number(top)) }).toFile(out)
