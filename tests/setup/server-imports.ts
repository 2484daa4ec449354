// The auto-imports Nitro gives server code (server/utils, shared/utils, h3, …), read from the
// list `nuxt prepare` writes, so the services project can import server/repos and
// server/services as the build does, without a build.
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const declarations = fileURLToPath(new URL('../../.nuxt/types/nitro-imports.d.ts', import.meta.url))

export function nitroAutoImports(): { name: string; as: string; from: string }[] {
  let text: string
  try {
    text = readFileSync(declarations, 'utf8')
  }
  catch {
    throw new Error(`${declarations} is missing: run npx nuxt prepare`)
  }
  const imports: { name: string; as: string; from: string }[] = []
  for (const m of text.matchAll(/^export \{ ([^}]+) \} from '([^']+)';?$/gm)) {
    for (const part of m[1]!.split(',')) {
      const [name, as = name] = part.trim().split(/\s+as\s+/)
      if (name) imports.push({ name, as: as!, from: m[2]! })
    }
  }
  return imports
}
