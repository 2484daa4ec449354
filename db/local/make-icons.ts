// npm run icons: the app's icons and favicon from public/icon.svg (our own drawing), through
// sharp. The sizes are those the web app manifest (public/manifest.webmanifest) and browsers
// ask for: 192 and 512 px (maskable too: the mark sits inside the safe zone's 80 % circle,
// W3C Web App Manifest "maskable" purpose), 180 px for iOS home screens, 32 px favicon.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import sharp from 'sharp'
import { root } from './config'

const svg = readFileSync(join(root, 'public/icon.svg'))
const out = (name: string) => join(root, 'public/icons', name)

async function main() {
  for (const size of [192, 512]) {
    await sharp(svg, { density: 300 }).resize(size, size).png({ compressionLevel: 9 }).toFile(out(`icon-${size}.png`))
    // maskable: the whole square is the kiln colour, the mark shrunk into the safe zone
    const inner = Math.round(size * 0.7)
    const mark = await sharp(svg, { density: 300 }).resize(inner, inner).png().toBuffer()
    await sharp({ create: { width: size, height: size, channels: 4, background: '#A6452B' } })
      .composite([{ input: mark, gravity: 'centre' }]).png({ compressionLevel: 9 }).toFile(out(`maskable-${size}.png`))
  }
  await sharp(svg, { density: 300 }).resize(180, 180).flatten({ background: '#A6452B' }).png().toFile(out('apple-touch-icon.png'))
  await sharp(svg, { density: 300 }).resize(32, 32).png().toFile(join(root, 'public/favicon.png'))
  console.log('icons written to public/icons and public/favicon.png')
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
