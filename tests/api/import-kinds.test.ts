// CSV import of grades, benches, clients with contacts, sites and open jobs with their items
// (server/services/imports.ts): each kind's preview shows every row with its problems per column
// in the user's words and writes nothing; confirm writes the whole file in one transaction (a
// late refusal rolls everything back); an export of each kind imports back as it is; an
// imperial workshop's headers are read and converted to metric.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, testDb } from '../setup/fixtures'

let lead = ''
let ws = 0
afterAll(closeTestDb)
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ws = await demoWorkshopId()
})

const tag = () => randomUUID().slice(0, 6).toUpperCase()
function upload(content: string, name = 'file.csv') {
  const f = new FormData()
  f.append('file', new Blob([content], { type: 'text/csv' }), name)
  return f
}
const post = (kind: string, step: 'preview' | 'confirm', csv: string) => call(`/api/import/${kind}/${step}`, { method: 'POST', form: upload(csv), cookie: lead })
const count = async (table: string) => Number((await testDb()(table).where({ workshop_id: ws }).count('* as n').first())!.n)
const lines = (rows: { line: number; problems: { column: string; message: string }[] }[]) => Object.fromEntries(rows.map(r => [r.line, r.problems]))

describe('benches and grades', () => {
  it('benches: preview names each problem; confirm writes them; an imperial length header is converted', async () => {
    const t = tag()
    const bad = ['name,kind,length (m),order,archived', `B-${t}-1,casting,3.6,40,no`, `B-${t}-1,casting,2,41,no`, `B-${t}-3,,2,42,no`, `B-${t}-4,casting,3 m,43,maybe`].join('\n')
    const before = await count('benches')
    const p = await post('benches', 'preview', bad)
    expect(p.status).toBe(200)
    const byLine = lines(p.data.rows)
    expect(byLine[2]).toEqual([])
    expect(byLine[3]).toEqual([{ column: 'name', message: `bench B-${t}-1 appears twice in this file (also line 2)` }])
    expect(byLine[4]![0]!.column).toBe('kind')
    expect(byLine[5]!.map(x => x.column).sort()).toEqual(['archived', 'length (m)'])
    expect(await count('benches')).toBe(before)
    // 120 in = 3.048 m exactly (NIST SP 811: 1 in = 0.0254 m); the bench length column keeps centimetres
    const imperial = ['name,kind,length (in),order,archived', `B-${t}-9,flat casting,120,44,no`].join('\n')
    expect((await post('benches', 'preview', imperial)).data.rows[0].cells['length (m)']).toBe('3.048')
    const ok = await post('benches', 'confirm', imperial)
    expect(ok.status).toBe(201)
    expect(Number((await testDb()('benches').where({ workshop_id: ws, name: `B-${t}-9` }).first('length_m')).length_m)).toBeCloseTo(3.05, 6)
  })

  it('grades: a preset fills the model, the file may narrow it; a consistency outside its range is named', async () => {
    const t = tag()
    const head = 'name,preset,bag (kg),consistency min,consistency max,consistency,demould (min),notes,archived'
    const p = await post('grades', 'preview', [head, `G-${t}-1,beta-casting,25,62,78,70,32,,no`, `G-${t}-2,moon dust,25,,,,,,no`, `G-${t}-3,Beta fine casting plaster,25,60,80,95,,,no`].join('\n'))
    const byLine = lines(p.data.rows)
    expect(byLine[2]).toEqual([])
    expect(byLine[3]![0]).toMatchObject({ column: 'preset' })
    expect(byLine[4]![0]!.column).toBe('consistency')
    expect((await post('grades', 'confirm', [head, `G-${t}-1,beta-casting,25,62,78,70,32,,no`].join('\n'))).status).toBe(201)
    const g = await testDb()('plaster_grades').where({ workshop_id: ws, name: `G-${t}-1` }).first()
    expect(g).toMatchObject({ preset_key: 'beta-casting', form: 'beta' })
    expect([Number(g.consistency_min), Number(g.consistency_max), Number(g.demould_minutes_ref)]).toEqual([62, 78, 32])
  })

  it('the export of benches and grades imports back (names taken: every row says so)', async () => {
    for (const kind of ['benches', 'grades']) {
      const exp = await call(`/api/import/${kind}/export`, { cookie: lead })
      expect(exp.status).toBe(200)
      const p = await post(kind, 'preview', String(exp.data))
      expect(p.data.fileProblems).toEqual([])
      expect(p.data.rows.length).toBeGreaterThan(0)
      expect(p.data.rows.every((r: { problems: { message: string }[] }) => /already a/.test(r.problems[0]?.message ?? ''))).toBe(true)
    }
  })
})

describe('clients, contacts and sites', () => {
  it('one row per contact: new clients made once, contacts added to an existing client, per-row problems named', async () => {
    const t = tag()
    const head = 'client,client notes,contact,e-mail,phone,role,progress mail,sample mail,dispatch mail'
    const csv = [head,
      `Client ${t},Pays on 30 days,Una One,una-${t}@c.example.test,,Architect,yes,no,yes`,
      `Client ${t},,Tom Two,tom-${t}@c.example.test,+44 1632 960111,,yes,yes,no`,
      `Hollin Row Architects,,Vic Three,vic-${t}@c.example.test,,,,,`,
      `Client ${t},,Una Again,una-${t}@c.example.test,,,,,`,
      `Client ${t},,No Mail,not-an-email,,,,,`,
      `Client ${t},,Bad Flag,flag-${t}@c.example.test,,,sometimes,,`,
    ].join('\n')
    const p = await post('clients', 'preview', csv)
    const byLine = lines(p.data.rows)
    expect([byLine[2], byLine[3], byLine[4]]).toEqual([[], [], []])
    expect(byLine[5]![0]).toEqual({ column: 'e-mail', message: `the e-mail una-${t.toLowerCase()}@c.example.test appears twice for Client ${t} in this file (also line 2)` })
    expect(byLine[6]![0]!.column).toBe('e-mail')
    expect(byLine[7]![0]).toEqual({ column: 'progress mail', message: 'progress mail must be yes or no' })
    const good = csv.split('\n').slice(0, 4).join('\n')
    const orgsBefore = await count('client_orgs')
    expect((await post('clients', 'confirm', good)).status).toBe(201)
    expect(await count('client_orgs')).toBe(orgsBefore + 1)
    const org = await testDb()('client_orgs').where({ workshop_id: ws, name: `Client ${t}` }).first()
    expect(org.notes).toBe('Pays on 30 days')
    const una = await testDb()('client_contacts').where({ client_org_id: org.id, email: `una-${t.toLowerCase()}@c.example.test` }).first()
    expect(una).toMatchObject({ name: 'Una One', role: 'Architect', mail_progress: true, mail_samples: false, mail_dispatch: true })
    // the same contact again is now "already in Setline"
    const again = await post('clients', 'preview', [head, `Client ${t},,Una One,una-${t}@c.example.test,,,,,`].join('\n'))
    expect(again.data.rows[0].problems[0].message).toMatch(/already has a contact with the e-mail/)
    // a file without the invoice mail column leaves it on
    expect(una.mail_invoices).toBe(true)
  })

  it('reads the invoice mail column (yes or no, on when empty) and exports it back', async () => {
    const t = tag()
    const head = 'client,contact,e-mail,invoice mail'
    const csv = [head, `Inv ${t},Ida Off,ida-${t}@c.example.test,no`, `Inv ${t},Ian On,ian-${t}@c.example.test,`, `Inv ${t},Ivo Odd,ivo-${t}@c.example.test,maybe`].join('\n')
    const p = await post('clients', 'preview', csv)
    expect(lines(p.data.rows)[4]).toEqual([{ column: 'invoice mail', message: 'invoice mail must be yes or no' }])
    expect((await post('clients', 'confirm', csv.split('\n').slice(0, 3).join('\n'))).status).toBe(201)
    const org = await testDb()('client_orgs').where({ workshop_id: ws, name: `Inv ${t}` }).first()
    const flags = await testDb()('client_contacts').where({ client_org_id: org.id }).orderBy('name').select('name', 'mail_invoices')
    expect(flags).toEqual([{ name: 'Ian On', mail_invoices: true }, { name: 'Ida Off', mail_invoices: false }])
    const exported = (await (await fetch(`${baseUrl()}/api/import/clients/export`, { headers: { cookie: lead } })).text()).replace(/^\uFEFF/, '').trim().split(/\r?\n/)
    expect(exported[0]).toMatch(/,dispatch mail,invoice mail$/)
    expect(exported.find(r => r.includes(`ida-${t.toLowerCase()}@c.example.test`))).toMatch(/,no$/)
  })

  it('sites name an existing client; an unknown client or a duplicate site is named', async () => {
    const t = tag()
    const head = 'client,site,address,postcode,opening hours,parking,lifting'
    const csv = [head,
      `Hollin Row Architects,Yard ${t},1 Yard Lane,EX1 1AA,08:00–16:00,Yard,Forklift`,
      `Nobody Ltd,Yard ${t},1 Yard Lane,,,,`,
      `Hollin Row Architects,Yard ${t},2 Yard Lane,,,,`,
      `Hollin Row Architects,Empty ${t},,,,,`,
    ].join('\n')
    const byLine = lines((await post('sites', 'preview', csv)).data.rows)
    expect(byLine[2]).toEqual([])
    expect(byLine[3]![0]!.message).toMatch(/client "Nobody Ltd" is not a client of this workshop/)
    expect(byLine[4]![0]!.message).toMatch(/appears twice in this file \(also line 2\)/)
    expect(byLine[5]![0]!.column).toBe('address')
    expect((await post('sites', 'confirm', csv.split('\n').slice(0, 2).join('\n'))).status).toBe(201)
    expect(await testDb()('client_sites').where({ workshop_id: ws, name: `Yard ${t}` }).first('lifting')).toEqual({ lifting: 'Forklift' })
  })
})

describe('open jobs with their items', () => {
  const head = 'job,title,client,site,site note,due on,sample,job notes,item,mould,profile,quantity,walls (m),shortest piece (m),spares (%),grade,consistency'

  it('previews jobs and items with per-row problems, then writes them all with their pieces', async () => {
    const t = tag()
    const k = testDb()
    const run = await k('moulds').where({ workshop_id: ws }).whereNotNull('cast_length_m').first('code', 'cast_length_m')
    const grade = (await k('plaster_grades').where({ workshop_id: ws }).first('name')).name
    const existingJob = (await k('jobs').where({ workshop_id: ws }).first('code')).code
    const csv = [head,
      `IJ-${t}-1,Library cornice,Hollin Row Architects,"Fernhill House, east wing",,2027-04-30,yes,,Cornice run,${run.code},,,5.2 4.1 5.2 4.1,,5,${grade},`,
      `IJ-${t}-1,,,,,,,,Ceiling rose,,Rose 600,6,,,,,`,
      `IJ-${t}-1,Another title,,,,,,,Corbel,,Corbel A,2,,,,,`,
      `${existingJob},Taken,,,,,,,Thing,,P,1,,,,,`,
      `IJ-${t}-5,Bad date,,,,30/04/2027,,,Thing,,P,1,,,,,`,
      `IJ-${t}-6,No such mould,,,,,,,Thing,NOPE-${t},,1,,,,,`,
      `IJ-${t}-7,Both,,,,,,,Thing,${run.code},,3,4.0,,,,`,
      `IJ-${t}-8,Site without client,,Alder Street,,,,,Thing,,P,1,,,,,`,
    ].join('\n')
    const before = { jobs: await count('jobs'), items: await count('job_items') }
    const p = await post('jobs', 'preview', csv)
    expect(p.status).toBe(200)
    const byLine = lines(p.data.rows)
    expect([byLine[2], byLine[3]]).toEqual([[], []])
    expect(byLine[4]![0]).toEqual({ column: 'title', message: 'title differs from line 2 of the same job: leave it empty or write the same' })
    expect(byLine[5]![0]).toEqual({ column: 'job', message: `job ${existingJob} is already a job in Setline` })
    expect(byLine[6]![0]!.message).toMatch(/due on: 30\/04\/2027 is a date in another format/)
    expect(byLine[7]![0]!.message).toMatch(/mould "NOPE-.*" is not a mould of this workshop/)
    expect(byLine[8]![0]!.message).toMatch(/quantity or walls \(m\), not both/)
    expect(byLine[9]![0]).toMatchObject({ column: 'site' })
    expect({ jobs: await count('jobs'), items: await count('job_items') }).toEqual(before)
    const good = csv.split('\n').slice(0, 3).join('\n')
    const r = await post('jobs', 'confirm', good)
    expect(r.status).toBe(201)
    const job = await k('jobs').where({ workshop_id: ws, code: `IJ-${t}-1` }).first('*', k.raw('to_char(due_on, \'YYYY-MM-DD\') AS due'))
    expect(job).toMatchObject({ title: 'Library cornice', sample_state: 'awaiting_cast', due: '2027-04-30' })
    expect(job.site_id).not.toBeNull()
    const items = await k('job_items').where({ job_id: job.id }).orderBy('sort_order')
    expect(items.map(i => i.description)).toEqual(['Cornice run', 'Ceiling rose'])
    // the run's pieces come from the run calculator on the mould's cast length (at least one piece per wall)
    expect(items[0].pieces_needed).toBeGreaterThanOrEqual(4)
    expect(Number(items[0].run_m)).toBeCloseTo(18.6, 6)
    expect(items[1]).toMatchObject({ quantity: 6, pieces_needed: 6 })
  })

  it('an imperial sheet\'s walls (in) land in metres; the export of open jobs reads back', async () => {
    const t = tag()
    const run = await testDb()('moulds').where({ workshop_id: ws }).whereNotNull('cast_length_m').first('code')
    const csv = [head.replace('walls (m)', 'walls (in)').replace('shortest piece (m)', 'shortest piece (in)'), `IK-${t},Imperial run,,,,,,,Run,${run.code},,,120 96,12,,,`].join('\n')
    const p = await post('jobs', 'preview', csv)
    expect(p.data.rows[0].problems).toEqual([])
    // 120 in = 3.048 m, 96 in = 2.4384 m, 12 in = 0.3048 m (NIST SP 811: 1 in = 0.0254 m)
    expect(p.data.rows[0].cells['walls (m)']).toBe('3.048 2.4384')
    expect(p.data.rows[0].cells['shortest piece (m)']).toBe('0.3048')
    expect((await post('jobs', 'confirm', csv)).status).toBe(201)
    const exp = await call('/api/import/jobs/export', { cookie: lead })
    expect(String(exp.data)).toContain(`IK-${t}`)
    const back = await post('jobs', 'preview', String(exp.data))
    expect(back.data.fileProblems).toEqual([])
    const ours = back.data.rows.filter((r: { cells: Record<string, string> }) => r.cells.job === `IK-${t}`)
    expect(ours[0].cells['walls (m)']).toBe('3.048 2.4384')
    expect(ours[0].problems[0].message).toBe(`job IK-${t} is already a job in Setline`)
  })

  it('a late refusal rolls the whole file back: nothing of it is written', async () => {
    const t = tag()
    const k = testDb()
    const csv = [head, `IL-${t}-1,First,,,,,,,Thing,,P,1,,,,,`, `IL-${t}-2,Second,,,,,,,Refused late,,P,1,,,,,`].join('\n')
    expect((await post('jobs', 'preview', csv)).data.ready).toBe(true)
    // the database refuses the last item while the jobs are already written in the transaction
    // (a trigger of this file's own database plays a refusal no check foresaw)
    await k.raw(`CREATE FUNCTION refuse_late() RETURNS trigger AS $$ BEGIN
      IF NEW.description = 'Refused late' THEN RAISE EXCEPTION 'late refusal' USING ERRCODE = '23514', CONSTRAINT = 'job_items_late_check'; END IF;
      RETURN NEW; END $$ LANGUAGE plpgsql`)
    await k.raw('CREATE TRIGGER refuse_late BEFORE INSERT ON job_items FOR EACH ROW EXECUTE FUNCTION refuse_late()')
    try {
      const r = await post('jobs', 'confirm', csv)
      expect(r.status).toBe(422)
    }
    finally {
      await k.raw('DROP TRIGGER refuse_late ON job_items')
      await k.raw('DROP FUNCTION refuse_late()')
    }
    expect(await k('jobs').where({ workshop_id: ws }).whereIn('code', [`IL-${t}-1`, `IL-${t}-2`]).count('* as n').first()).toEqual({ n: '0' })
    // and a code someone added between preview and confirm is refused before anything is written
    await k('jobs').insert({ workshop_id: ws, code: `IL-${t}-2`, title: 'Meanwhile' })
    const again = await post('jobs', 'confirm', csv.replace('Refused late', 'Fine'))
    expect(again.status).toBe(422)
    expect(await k('jobs').where({ workshop_id: ws, code: `IL-${t}-1` }).first()).toBeUndefined()
  })
})
