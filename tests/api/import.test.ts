// CSV import (server/services/imports.ts): a preview writes nothing and shows each row with its
// problems in the user's words; confirm writes the whole file in one transaction or nothing;
// another workshop neither sees nor collides with the rows; only a lead may import.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, testDb } from '../setup/fixtures'

let lead = ''
afterAll(closeTestDb)
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
})

const tag = () => randomUUID().slice(0, 6).toUpperCase()
function upload(content: string | Uint8Array<ArrayBuffer>, name = 'moulds.csv') {
  const f = new FormData()
  f.append('file', new Blob([content], { type: 'text/csv' }), name)
  return f
}
const post = (step: 'preview' | 'confirm', form: FormData, cookie = lead) => call(`/api/import/moulds/${step}`, { method: 'POST', form, cookie })
const HEADER = 'code,casts,material,bench,cavity (L),cast length (m),prep (min),clean-out (min),maximum dwell (min),pulls,expected pulls,state,state reason'
// the export's and template's columns: HEADER, then the cast columns (a file without them still imports)
const EXPORT_HEADER = `${HEADER},cavities,cast,face area (m²),shell thickness (mm)`
async function mouldCount(workshopId?: number) {
  const r = await testDb()('moulds').where({ workshop_id: workshopId ?? await demoWorkshopId() }).count('* as n').first()
  return Number(r!.n)
}

describe('mould import', () => {
  it('previews every row with its problems per column, writing nothing', async () => {
    const t = tag()
    const existing = (await testDb()('moulds').where({ workshop_id: await demoWorkshopId() }).first('code')).code
    const csv = [
      HEADER,
      `IM-${t}-1,Egg-and-dart cornice,silicone,,4.2,1.2,10,10,120,0,150,ready,`,
      `IM-${t}-2,Ceiling rose,Polyurethane rubber,,"3,5",,10,10,120,0,,ready,`,
      `IM-${t}-1,Same code again,silicone,,2,,10,10,120,0,,ready,`,
      `${existing},Already there,silicone,,2,,10,10,120,0,,ready,`,
      `IM-${t}-5,Unit in the cell,silicone,,12 L,,10,10,120,0,,ready,`,
      `IM-${t}-6,No such bench,gelatine,Bench Nowhere,2,,10,10,120,0,,ready,`,
      `IM-${t}-7,Retired without reason,silicone,,2,,10,10,120,0,,retired,`,
      `IM-${t}-8,Bad material,bronze,,2,,10,10,120,0,,ready,`,
    ].join('\n')
    const before = await mouldCount()
    const r = await post('preview', upload(csv))
    expect(r.status).toBe(200)
    expect(r.data).toMatchObject({ kind: 'moulds', rowCount: 8, problemRows: 7, ready: false, fileProblems: [] })
    const byLine = Object.fromEntries(r.data.rows.map((row: { line: number }) => [row.line, row]))
    expect(byLine[2].problems).toEqual([])
    expect(byLine[2].cells).toMatchObject({ 'code': `IM-${t}-1`, 'cavity (L)': '4.2' })
    expect(byLine[3].problems).toEqual([{ column: 'cavity (L)', message: 'cavity (L): write 3,5 with a decimal point (3.5)' }])
    expect(byLine[4].problems[0]).toEqual({ column: 'code', message: `code IM-${t}-1 appears twice in this file (also line 2)` })
    expect(byLine[5].problems[0]).toEqual({ column: 'code', message: `code ${existing} is already a mould in Setline` })
    expect(byLine[6].problems[0].message).toMatch(/^cavity \(L\): write the figure alone \(12\); the unit belongs in the column name/)
    expect(byLine[7].problems[0].message).toMatch(/bench "Bench Nowhere" is not a bench of this workshop/)
    expect(byLine[8].problems[0]).toEqual({ column: 'state reason', message: 'state reason is required for a mould in repair or retired' })
    expect(byLine[9].problems[0].column).toBe('material')
    expect(await mouldCount()).toBe(before)
    // confirm refuses the same file, with the preview, and writes nothing
    const refused = await post('confirm', upload(csv))
    expect(refused.status).toBe(422)
    expect(refused.data.data.preview.problemRows).toBe(7)
    expect(await mouldCount()).toBe(before)
  })

  it('names file-level problems: wrong column, workbook, UTF-16, another encoding', async () => {
    const wrong = await post('preview', upload('code,casts,material,cavity,colour\nA,b,silicone,1,red\n'))
    expect(wrong.data.fileProblems.join(' ')).toMatch(/Columns "cavity", "colour" are not one Setline knows for moulds/)
    // the cavity column may be absent (a fibrous mould's plaster comes from its face and shell); a solid row without it is refused per row
    expect(wrong.data.fileProblems.join(' ')).not.toMatch(/Column "cavity \(L\)" is missing/)
    const xlsx = await post('preview', upload(new Uint8Array([0x50, 0x4B, 0x03, 0x04, 0x14, 0, 6, 0]), 'moulds.xlsx'))
    expect(xlsx.data.fileProblems[0]).toMatch(/spreadsheet workbook \(such as \.xlsx or \.ods\), not CSV/)
    const utf16 = new Uint8Array([0xFF, 0xFE, ...[...'code,casts'].flatMap(c => [c.charCodeAt(0), 0])])
    expect((await post('preview', upload(utf16))).data.fileProblems[0]).toMatch(/saved as UTF-16/)
    // "Moulding, 20°C" in Windows-1252: ° is the single byte B0, not valid UTF-8
    const latin = new Uint8Array([...new TextEncoder().encode(`${HEADER}\nL-1,Moulding 20`), 0xB0, ...new TextEncoder().encode(',silicone,,2,,10,10,120,0,,ready,\n')])
    expect((await post('preview', upload(latin))).data.fileProblems[0]).toMatch(/not UTF-8 \(it may be saved as Windows-1252/)
    for (const r of [wrong, xlsx]) expect(r.data.ready).toBe(false)
  })

  it('imports a clean file in one go, as an export reads back, semicolons and BOM included', async () => {
    const t = tag()
    const before = await mouldCount()
    const csv = `\uFEFF${HEADER.replaceAll(',', ';')}\nIM-${t}-A;Modillion;silicone;;2.5;;12;8;90;3;;ready;\nIM-${t}-B;'=Bracket;plaster_piece;;1.25;0.6;10;10;120;0;40;repair;torn key\n`
    const preview = await post('preview', upload(csv))
    expect(preview.data).toMatchObject({ ready: true, rowCount: 2 })
    expect(await mouldCount()).toBe(before)
    const done = await post('confirm', upload(csv))
    expect(done.status).toBe(201)
    expect(done.data).toEqual({ kind: 'moulds', imported: 2 })
    const rows = await testDb()('moulds').where({ workshop_id: await demoWorkshopId() }).whereIn('code', [`IM-${t}-A`, `IM-${t}-B`]).orderBy('code')
    expect(rows.map(r => [r.code, r.casts, r.material, Number(r.cavity_litres), r.prep_minutes, r.pulls, r.state, r.state_reason])).toEqual([
      [`IM-${t}-A`, 'Modillion', 'silicone', 2.5, 12, 3, 'ready', null],
      [`IM-${t}-B`, '=Bracket', 'plaster_piece', 1.25, 10, 0, 'repair', 'torn key'],
    ])
    // the export's columns are the import's: the exported file previews with every row a duplicate
    const exported = await fetch(`${(await import('../setup/context')).testContext().baseUrl}/api/moulds/export`, { headers: { cookie: lead } })
    const again = await post('preview', upload(new Uint8Array(await exported.arrayBuffer())))
    expect(again.data.fileProblems).toEqual([])
    expect(again.data.problemRows).toBe(again.data.rowCount)
    expect(again.data.rows[0].problems[0].message).toMatch(/is already a mould in Setline/)
  })

  it('rolls the whole file back when a late row is refused by the database', async () => {
    const t = tag()
    const db = testDb()
    // a refusal only the database makes, on the file's last row, after the others were inserted
    await db.raw(`CREATE FUNCTION refuse_late_row() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN IF NEW.casts = 'refused late' THEN RAISE EXCEPTION 'late refusal' USING ERRCODE = 'check_violation'; END IF; RETURN NEW; END $$`)
    await db.raw('CREATE TRIGGER refuse_late_row BEFORE INSERT ON moulds FOR EACH ROW EXECUTE FUNCTION refuse_late_row()')
    try {
      const lines = Array.from({ length: 600 }, (_, i) => `IM-${t}-${i},Dentil ${i},silicone,,1,,10,10,120,0,,ready,`)
      lines.push(`IM-${t}-LAST,refused late,silicone,,1,,10,10,120,0,,ready,`)
      const before = await mouldCount()
      const r = await post('confirm', upload([HEADER, ...lines].join('\n')))
      expect(r.status).toBe(422)
      expect(await mouldCount()).toBe(before)
      expect(await db('moulds').where('code', 'like', `IM-${t}-%`).count('* as n').first()).toEqual({ n: '0' })
    }
    finally {
      await db.raw('DROP TRIGGER refuse_late_row ON moulds')
      await db.raw('DROP FUNCTION refuse_late_row()')
    }
  })

  it('keeps to the lead\'s workshop: another workshop\'s codes do not collide and its lead sees none of these rows', async () => {
    const other = await makeOtherWorkshop()
    const t = tag()
    await testDb()('moulds').insert({ workshop_id: other.workshopId, code: `IM-${t}-X`, casts: 'theirs', material: 'silicone', cavity_litres: 1 })
    const csv = `${HEADER}\nIM-${t}-X,ours,silicone,,1,,10,10,120,0,,ready,\n`
    const preview = await post('preview', upload(csv))
    expect(preview.data.ready).toBe(true)
    expect((await post('confirm', upload(csv))).status).toBe(201)
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const theirs = await call('/api/moulds', { cookie: otherLead })
    expect(theirs.data.map((m: { code: string; casts: string }) => m.casts)).toEqual(['theirs'])
    const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
    expect((await post('preview', upload(csv), caster)).status).toBe(403)
    expect((await post('preview', upload(csv), '')).status).toBe(401)
  })

  it('imports plaster lots, naming a date in another format and an unknown grade', async () => {
    const t = tag()
    const ws = await demoWorkshopId()
    const grade = (await testDb()('plaster_grades').where({ workshop_id: ws }).first('name')).name
    const head = 'lot code,grade,bags received,bag kg,received on,use by,archived,notes'
    const bad = `${head}\nLI-${t}-1,${grade},40,25,01/03/2027,,no,\nLI-${t}-2,Moon dust,10,25,2027-03-01,,no,\nLI-${t}-3,${grade},10,25kg,2027-03-01,2027-02-01,no,\n`
    const r = await call('/api/import/lots/preview', { method: 'POST', form: upload(bad, 'lots.csv'), cookie: lead })
    expect(r.data.problemRows).toBe(3)
    expect(r.data.rows[0].problems).toEqual([{ column: 'received on', message: 'received on: 01/03/2027 is a date in another format: write it as YYYY-MM-DD (for example 2027-03-31)' }])
    expect(r.data.rows[1].problems[0].message).toMatch(/grade "Moon dust" is not a plaster grade of this workshop/)
    // the use-by order is checked once the row's fields read (zod runs refinements after the fields pass)
    expect(r.data.rows[2].problems.map((p: { column: string }) => p.column)).toEqual(['bag kg'])
    const good = `${head}\nLI-${t}-1,${grade},40,25,2027-03-01,2027-09-01,no,\nLI-${t}-2,${grade},5,25,2027-01-10,,yes,old stock\n`
    expect((await call('/api/import/lots/confirm', { method: 'POST', form: upload(good, 'lots.csv'), cookie: lead })).data).toEqual({ kind: 'lots', imported: 2 })
    const rows = await testDb()('plaster_lots').where({ workshop_id: ws }).where('lot_code', 'like', `LI-${t}-%`).orderBy('lot_code')
    expect(rows.map(l => [l.lot_code, l.bags_received, l.archived_at !== null, l.notes])).toEqual([[`LI-${t}-1`, 40, false, null], [`LI-${t}-2`, 5, true, 'old stock']])
  })

  it('offers a template with the export\'s columns', async () => {
    const r = await fetch(`${(await import('../setup/context')).testContext().baseUrl}/api/import/moulds/template`, { headers: { cookie: lead } })
    const text = (await r.text()).replace(/^\uFEFF/, '')
    expect(text.split(/\r?\n/)[0]).toBe(EXPORT_HEADER)
    const exported = await fetch(`${(await import('../setup/context')).testContext().baseUrl}/api/moulds/export`, { headers: { cookie: lead } })
    expect((await exported.text()).replace(/^\uFEFF/, '').split(/\r?\n/)[0]).toBe(EXPORT_HEADER)
  })
})
