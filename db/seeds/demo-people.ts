// The invented people of the demo workshop. Nothing here is a real firm or person.
export const DEMO_PASSWORD = 'setline-demo-2026'

// The shop-floor people have a tablet PIN, so a newcomer can try the shared tablet at once
// (People → "Use this device as a shared tablet" as the lead, then tap a name).
export const DEMO_USERS = [
  { key: 'lead', role: 'lead', name: 'Morwenna Castellan', email: 'lead@larkspur.example.test' },
  { key: 'caster1', role: 'caster', name: 'Idris Penhallow', email: 'idris@larkspur.example.test', pin: '4071' },
  { key: 'caster2', role: 'caster', name: 'Sunniva Achterberg', email: 'sunniva@larkspur.example.test', pin: '5286' },
  { key: 'finisher', role: 'finisher', name: 'Teodor Valance', email: 'teodor@larkspur.example.test', pin: '6392' },
  { key: 'client1', role: 'client', name: 'Ada Merriweather', email: 'ada@hollinrow.example.test', org: 'Hollin Row Architects' },
  { key: 'client2', role: 'client', name: 'Ravi Quennell', email: 'ravi@quaysideinteriors.example.test', org: 'Quayside Interiors' },
] as const

export type DemoUserKey = (typeof DEMO_USERS)[number]['key']
