import { describe, expect, it } from 'vitest'
import { codebookToCsv, planCodebookImport, type CsvExportCode, type ExistingCode } from '../../shared/coding/codebook-csv.js'

// Sources for the expected values:
// - RFC 4180 (Shafranovich 2005), §2: records are separated by CRLF (rule 1), an optional header
//   line (rule 3), cells holding a comma, a double quote or a line break are enclosed in double quotes
//   (rule 6), and a double quote inside such a cell is written twice (rule 7).
// - OWASP, "CSV Injection": a cell starting with = + - @ tab or carriage return is read as a
//   formula by spreadsheet programs; prefixing a single quote makes it text.
// - The Unicode Standard, chapter 23 "Special Areas and Format Characters" (section number from
//   memory): U+FEFF at the start of a file is a byte-order mark, not content.
// - Unicode Standard Annex #15 (Normalization Forms): "é" U+00E9 and "e" + U+0301 are canonically
//   equivalent and have the same NFC form.
const HEADER = 'label,parent,definition,when_to_use,when_not_to_use,colour,status'

const code = (id: string, label: string, parentId: string | null, position: number, extra: Partial<CsvExportCode> = {}): CsvExportCode => ({
  id,
  label,
  parentId,
  position,
  definition: '',
  whenToUse: '',
  whenNotToUse: '',
  colour: '#0072B2',
  status: 'active',
  ...extra,
})

// The invented demo study "Coming Home After Stroke", with cells that stress the format.
const book: CsvExportCode[] = [
  code('stairs', 'Stairs', 'home', 0, { definition: 'Steps, stairs and "the dreaded landing".\nIncludes outside steps.', colour: '#E69F00' }),
  code('home', 'Living at home', null, 1, { whenToUse: 'Daily life after discharge, at home', colour: '#009E73' }),
  code('info', 'Information at discharge', null, 0, { definition: '- leaflets\n- talks with the nurse', whenNotToUse: '=not for later follow-up' }),
  code('greek', 'Κόπωση', 'info', 1, { definition: 'Κούραση του φροντιστή', status: 'retired' }),
  code('japanese', '階段の不安', 'home', 1, { definition: '家の階段についての不安' }),
  code('arabic', 'الدعم من الأسرة', null, 2, { definition: 'مساعدة من أفراد الأسرة', colour: '#000000' }),
  code('old', 'Tiredness', null, 3, { status: 'merged' }),
]
const existing: ExistingCode[] = book.map(({ position: _position, ...rest }) => rest)

describe('codebookToCsv', () => {
  it('writes the header and one CRLF-ended record per code, parents before children, merged codes left out', () => {
    const csv = codebookToCsv(book)
    const records = csv.split('\r\n')
    expect(records[0]).toBe(HEADER)
    expect(csv.endsWith('\r\n')).toBe(true)
    const labels = records.slice(1).map((record) => record.split(',')[0])
    expect(labels[0]).toBe('Information at discharge')
    expect(csv.indexOf('Living at home,')).toBeLessThan(csv.indexOf('Stairs,Living at home'))
    expect(csv).not.toContain('Tiredness')
  })

  it('quotes cells with commas, quotes and line breaks and doubles inner quotes (RFC 4180 rules 6 and 7)', () => {
    const csv = codebookToCsv(book)
    expect(csv).toContain('Stairs,Living at home,"Steps, stairs and ""the dreaded landing"".\nIncludes outside steps.",,,#E69F00,active\r\n')
    expect(csv).toContain('Living at home,,,"Daily life after discharge, at home",,#009E73,active\r\n')
  })

  it('puts an apostrophe before cells a spreadsheet would run as a formula (OWASP CSV Injection)', () => {
    const csv = codebookToCsv([
      code('a', '=HYPERLINK("x")', null, 0),
      code('b', '+1 carer', null, 1),
      code('c', '@home', null, 2),
      code('d', 'Tab', null, 3, { definition: '\tindented' }),
    ])
    expect(csv).toContain(`'=HYPERLINK(""x"")`)
    expect(csv).toContain("'+1 carer,")
    expect(csv).toContain("'@home,")
    expect(csv).toContain("Tab,,'\tindented,")
    expect(codebookToCsv(book)).toContain("\"'- leaflets\n- talks with the nurse\",,'=not for later follow-up,")
  })

  it('keeps Greek, Japanese and Arabic text as it is', () => {
    const csv = codebookToCsv(book)
    expect(csv).toContain('Κόπωση,Information at discharge,Κούραση του φροντιστή,,,#0072B2,retired')
    expect(csv).toContain('階段の不安,Living at home,家の階段についての不安')
    expect(csv).toContain('الدعم من الأسرة,,مساعدة من أفراد الأسرة')
  })

  it('starts with a byte-order mark only when asked', () => {
    expect(codebookToCsv(book, { bom: true }).startsWith(`\uFEFF${HEADER}`)).toBe(true)
    expect(codebookToCsv(book).startsWith(HEADER)).toBe(true)
  })
})

describe('planCodebookImport: round trip', () => {
  it('finds every code unchanged when a file exported from the same codebook comes back', () => {
    const plan = planCodebookImport(codebookToCsv(book), existing)
    expect(plan).toEqual({ creates: [], updates: [], unchanged: 6, errors: [] })
  })

  it('does the same for a file with a byte-order mark and CRLF line breaks inside cells', () => {
    const csv = codebookToCsv(book, { bom: true }).replace('stairs and ""the dreaded landing"".\n', 'stairs and ""the dreaded landing"".\r\n')
    expect(planCodebookImport(csv, existing)).toEqual({ creates: [], updates: [], unchanged: 6, errors: [] })
  })

  it('matches labels whatever their case, spaces or Unicode composition (UAX #15)', () => {
    const cafe = [{ ...existing[1], id: 'cafe', label: 'Caf\u00e9 visits', parentId: null }]
    const csv = `label,definition\n  CAFE\u0301 VISITS  ,\n`
    expect(planCodebookImport(csv, cafe)).toEqual({ creates: [], updates: [], unchanged: 1, errors: [] })
  })
})

describe('planCodebookImport: creates and updates', () => {
  it('creates new codes, a parent named later in the file placed first, with defaults for empty cells', () => {
    const csv = [HEADER, 'Stair lift,Adaptations,,,,sky blue,', 'Adaptations,Living at home,Changes made to the home,,,#cc79a7,retired', 'Grab rails,Adaptations,,,,,'].join('\r\n')
    const plan = planCodebookImport(csv, existing)
    expect(plan.errors).toEqual([])
    expect(plan.creates).toEqual([
      { label: 'Adaptations', parentLabel: 'Living at home', definition: 'Changes made to the home', whenToUse: '', whenNotToUse: '', colour: '#CC79A7', status: 'retired' },
      { label: 'Stair lift', parentLabel: 'Adaptations', definition: '', whenToUse: '', whenNotToUse: '', colour: '#56B4E9', status: 'active' },
      { label: 'Grab rails', parentLabel: 'Adaptations', definition: '', whenToUse: '', whenNotToUse: '', colour: null, status: 'active' },
    ])
  })

  it('lists only the fields that change, and writes parents with the codebook’s own label', () => {
    const csv = [HEADER, 'stairs,information AT discharge,"Steps, stairs and ""the dreaded landing"".\nIncludes outside steps.",Any stairs,,Vermilion,retired'].join('\n')
    const plan = planCodebookImport(csv, existing)
    expect(plan.updates).toEqual([{ id: 'stairs', changes: { parentLabel: 'Information at discharge', whenToUse: 'Any stairs', colour: '#D55E00', status: 'retired' } }])
    expect(plan.unchanged).toBe(0)
  })

  it('keeps what a file leaves out: missing columns and empty colour cells change nothing', () => {
    const plan = planCodebookImport('label,colour\nStairs,\nLiving at home,\n', existing)
    expect(plan).toEqual({ creates: [], updates: [], unchanged: 2, errors: [] })
  })

  it('moves a code to the top level when its parent cell is empty', () => {
    const plan = planCodebookImport('label,parent\nStairs,\n', existing)
    expect(plan.updates).toEqual([{ id: 'stairs', changes: { parentLabel: null } }])
  })

  it('reads a file separated by semicolons and keeps an apostrophe that starts ordinary text', () => {
    const plan = planCodebookImport("label;definition\nHospital staff;'Tis what they said\n", existing)
    expect(plan.creates).toEqual([expect.objectContaining({ label: 'Hospital staff', definition: "'Tis what they said" })])
  })

  it('skips empty lines but keeps counting them as rows', () => {
    const plan = planCodebookImport('label,status\nNew one,\n\n,\nBad,waiting\n', existing)
    expect(plan.errors).toEqual([{ row: 4, column: 'status', message: 'Row 4: the status “waiting” is neither active nor retired.' }])
  })
})

describe('planCodebookImport: mistakes', () => {
  const errorsOf = (csv: string) => planCodebookImport(csv, existing).errors

  it('names the row and the parent that is nowhere to be found', () => {
    const csv = 'label,parent\nA,\nB,A\nC,Feelings\n'
    expect(errorsOf(csv)).toEqual([{ row: 3, column: 'parent', message: 'Row 3: the parent “Feelings” is neither in this file nor in the codebook.' }])
  })

  it('refuses an empty label, a label over 80 characters and labels with markup brackets or control characters', () => {
    const long = 'x'.repeat(81)
    const csv = `label,definition\n,orphan\n${long},\n<b>Bold</b>,\n"Line\nbreak",\nFine,\n`
    const errors = errorsOf(csv)
    expect(errors.map((e) => [e.row, e.column])).toEqual([
      [1, 'label'],
      [2, 'label'],
      [3, 'label'],
      [4, 'label'],
    ])
    expect(errors[0].message).toBe('Row 1: the label is empty; every code needs one.')
    expect(errors[1].message).toBe('Row 2: the label has 81 characters; a code label has at most 80.')
    expect(planCodebookImport(`label\n${'y'.repeat(80)}\n`, existing).errors).toEqual([])
  })

  it('refuses the same label twice in one file, whatever the case', () => {
    expect(errorsOf('label\nDriving\nParking\ndriving\n')).toEqual([{ row: 3, column: 'label', message: 'Row 3: the code “driving” is already on row 1; list each code once.' }])
  })

  it('refuses a code that is its own parent', () => {
    expect(errorsOf('label,parent\nDriving,driving\n')).toEqual([{ row: 1, column: 'parent', message: 'Row 1: “Driving” cannot be its own parent.' }])
  })

  it('refuses parents that go round in a circle, within the file or through the codebook', () => {
    const inFile = errorsOf('label,parent\nA,B\nB,C\nC,A\nD,\n')
    expect(inFile).toHaveLength(1)
    expect(inFile[0]).toMatchObject({ row: 1, column: 'parent' })
    expect(inFile[0].message).toContain('“A” › “B” › “C” › “A”')
    // Living at home is the parent of Stairs in the codebook: putting it under Stairs closes a loop.
    expect(errorsOf('label,parent\nLiving at home,Stairs\n')).toEqual([
      { row: 1, column: 'parent', message: 'Row 1: these parents go round in a circle: “Living at home” › “Stairs” › “Living at home”.' },
    ])
  })

  it('refuses colours outside the palette and statuses other than active or retired', () => {
    const errors = errorsOf('label,colour,status\nA,red,\nB,#E69F01,\nC,,merged\nD,,closed\nE,orange,ACTIVE\n')
    expect(errors.map((e) => [e.row, e.column])).toEqual([
      [1, 'colour'],
      [2, 'colour'],
      [3, 'status'],
      [4, 'status'],
    ])
    expect(errors[0].message).toContain('“red” is not one of the eight code colours')
    expect(errors[2].message).toBe('Row 3: an import cannot merge codes: merge “C” in the codebook instead, or write active or retired.')
  })

  it('refuses a row that matches a merged code', () => {
    expect(errorsOf('label\nTiredness\n')).toEqual([expect.objectContaining({ row: 1, column: 'label' })])
  })

  it('refuses a definition over 4000 and “when” texts over 2000 characters', () => {
    const csv = `label,definition,when_to_use,when_not_to_use\nA,${'d'.repeat(4001)},,\nB,,${'w'.repeat(2001)},\nC,,,${'n'.repeat(2001)}\nD,${'d'.repeat(4000)},${'w'.repeat(2000)},${'n'.repeat(2000)}\n`
    expect(errorsOf(csv).map((e) => [e.row, e.column])).toEqual([
      [1, 'definition'],
      [2, 'when_to_use'],
      [3, 'when_not_to_use'],
    ])
  })

  it('names every unknown column in the header and imports nothing', () => {
    const plan = planCodebookImport('label,Notes,colour,weight\nA,x,,1\n', existing)
    expect(plan.creates).toEqual([])
    expect(plan.errors).toEqual([
      { row: 0, column: null, message: 'Header: Heardwell does not know the columns “notes”, “weight”. Use only label, parent, definition, when_to_use, when_not_to_use, colour, status.' },
    ])
  })

  it('needs a label column, but allows the other columns to be missing', () => {
    expect(errorsOf('parent,definition\nA,x\n')).toEqual([{ row: 0, column: 'label', message: 'Header: the file needs a “label” column.' }])
    expect(errorsOf('label\nA\n')).toEqual([])
  })

  it('refuses more than 2000 rows', () => {
    const rows = Array.from({ length: 2001 }, (_, i) => `Code ${i}`)
    expect(errorsOf(`label\n${rows.join('\n')}\n`)).toEqual([{ row: 0, column: null, message: 'The file has 2001 rows; a codebook file has at most 2000.' }])
    expect(errorsOf(`label\n${rows.slice(1).join('\n')}\n`)).toEqual([])
  })

  it('reports a quoted cell that is never closed with its row, counting a multi-line cell as one row', () => {
    const errors = errorsOf('label,definition\nA,"two\nlines"\nB,"never closed\n')
    expect(errors).toEqual([{ row: 2, column: null, message: 'Row 2: a quoted cell is never closed (a closing " is missing).' }])
  })

  it('refuses a row with more cells than the header has columns', () => {
    expect(errorsOf('label,parent\nA,,extra\n')).toEqual([{ row: 1, column: null, message: 'Row 1 has 3 cells, but the header names 2 columns.' }])
  })

  it('refuses an empty file and a file with only a header', () => {
    expect(errorsOf('')[0].message).toMatch(/^The file is empty/)
    expect(errorsOf('\uFEFF\r\n')[0].message).toMatch(/^The file is empty/)
    expect(errorsOf(`${HEADER}\r\n`)).toEqual([{ row: 0, column: null, message: 'The file has a header but no codes below it.' }])
  })

  it('still checks a child against a parent row that has a mistake of its own', () => {
    const errors = errorsOf('label,parent,colour\nAdaptations,,pink\nStair lift,Adaptations,\n')
    expect(errors).toEqual([expect.objectContaining({ row: 1, column: 'colour' })])
  })
})
