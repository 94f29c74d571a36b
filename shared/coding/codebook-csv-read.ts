import Papa from 'papaparse'
import { OKABE_ITO, type CodeStatus } from '../schemas/coding.js'

/**
 * Reading a codebook CSV file into rows, cell by cell, with a message for every cell that cannot
 * be used. Matching the rows against the codebook is codebook-csv.ts's job.
 */

export const CODEBOOK_CSV_COLUMNS = ['label', 'parent', 'definition', 'when_to_use', 'when_not_to_use', 'colour', 'status'] as const
export type CodebookCsvColumn = (typeof CODEBOOK_CSV_COLUMNS)[number]
export const MAX_IMPORT_ROWS = 2000

export type ImportableStatus = Exclude<CodeStatus, 'merged'>

export interface CodebookImportError {
  /** data rows count from 1; 0 is the header or the file as a whole */
  row: number
  column: CodebookCsvColumn | null
  message: string
}

/** One data row as read. `undefined`: the file has no such column (keep what the code has). */
export interface CodebookRow {
  row: number
  label: string
  /** null: the cell is empty (a top-level code) */
  parent?: string | null
  definition?: string
  whenToUse?: string
  whenNotToUse?: string
  /** null: the cell is empty (keep the colour, or the default for a new code) */
  colour?: string | null
  status?: ImportableStatus
  /** a cell of this row has a mistake: the row takes part in matching but is never imported */
  faulty: boolean
}

/**
 * Neutralises spreadsheet formulas: a cell starting with = + - @ tab or carriage return gets a
 * leading apostrophe (OWASP "CSV Injection"; OWASP ASVS 5.0 requirement 1.2.10).
 */
export function neutraliseFormula(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value
}

/** Undoes neutraliseFormula on a cell read back from a file. */
export function restoreFormula(value: string): string {
  return /^'[=+\-@\t\r]/.test(value) ? value.slice(1) : value
}

/** The key that matches labels: trimmed, NFC, case-insensitive. */
export const labelKey = (label: string): string => label.trim().normalize('NFC').toLowerCase()

/** Text as compared and stored: NFC with line feeds only (spreadsheets may write CR LF inside cells). */
export const normaliseCellText = (value: string): string => value.normalize('NFC').replace(/\r\n?/g, '\n')

/** An Okabe–Ito colour from its hex (any case, with or without #) or its name (any case). */
export function colourFromCell(value: string): string | null {
  const wanted = value.trim().toLowerCase().replace(/\s+/g, ' ')
  const asHex = wanted.startsWith('#') ? wanted : `#${wanted}`
  return OKABE_ITO.find((colour) => colour.hex.toLowerCase() === asHex || colour.name.toLowerCase() === wanted)?.hex ?? null
}

const TEXT_FIELDS = [
  { field: 'definition', column: 'definition', words: 'definition', max: 4000 },
  { field: 'whenToUse', column: 'when_to_use', words: '“when to use”', max: 2000 },
  { field: 'whenNotToUse', column: 'when_not_to_use', words: '“when not to use”', max: 2000 },
] as const

function quoteProblem(code: string, message: string): string {
  if (code === 'MissingQuotes') return 'a quoted cell is never closed (a closing " is missing).'
  if (code === 'InvalidQuotes') return 'a quote mark inside a quoted cell must be doubled ("").'
  return `${message}.`
}

/** The header names the columns; a comma, semicolon or tab between them is the file's separator. */
function separatorOf(text: string): string {
  const header = text.slice(0, text.search(/\r|\n|$/))
  return [',', ';', '\t'].find((candidate) => header.includes(candidate)) ?? ','
}

const blank = (record: string[]) => record.every((cell) => cell.trim() === '')
const quoted = (names: string[]) => names.map((name) => (name === '' ? 'an unnamed column' : `“${name}”`)).join(', ')

function readHeader(records: string[][], fail: (message: string, column?: CodebookCsvColumn) => void): string[] {
  const header = records[0].map((name) => name.replace(/^\uFEFF/, '').trim().toLowerCase())
  const unknown = header.filter((name) => !(CODEBOOK_CSV_COLUMNS as readonly string[]).includes(name))
  if (unknown.length > 0) fail(`Header: Heardwell does not know the column${unknown.length > 1 ? 's' : ''} ${quoted(unknown)}. Use only ${CODEBOOK_CSV_COLUMNS.join(', ')}.`)
  const twice = [...new Set(header.filter((name, index) => name !== '' && header.indexOf(name) !== index))]
  if (twice.length > 0) fail(`Header: the column${twice.length > 1 ? 's' : ''} ${quoted(twice)} ${twice.length > 1 ? 'appear' : 'appears'} twice.`)
  if (!header.includes('label')) fail('Header: the file needs a “label” column.', 'label')
  return header
}

export function readCodebookRows(csv: string): { rows: CodebookRow[]; errors: CodebookImportError[] } {
  const errors: CodebookImportError[] = []
  const fail = (row: number, column: CodebookCsvColumn | null, message: string) => errors.push({ row, column, message })
  const text = csv.replace(/^\uFEFF/, '')
  const parsed = Papa.parse<string[]>(text, { header: false, delimiter: separatorOf(text), skipEmptyLines: false })
  for (const problem of parsed.errors) {
    const row = problem.row ?? 0
    fail(row, null, `${row === 0 ? 'Header' : `Row ${row}`}: ${quoteProblem(problem.code, problem.message)}`)
  }
  if (errors.length > 0) return { rows: [], errors }

  const records = parsed.data
  while (records.length > 0 && blank(records[records.length - 1])) records.pop()
  if (records.length === 0) {
    fail(0, null, 'The file is empty: it needs a header row (label, parent, definition …) and a row for each code.')
    return { rows: [], errors }
  }
  const header = readHeader(records, (message, column) => fail(0, column ?? null, message))
  const data = records.slice(1)
  if (errors.length === 0 && data.length === 0) fail(0, null, 'The file has a header but no codes below it.')
  if (data.length > MAX_IMPORT_ROWS) fail(0, null, `The file has ${data.length} rows; a codebook file has at most ${MAX_IMPORT_ROWS}.`)
  if (errors.length > 0) return { rows: [], errors }

  const rows: CodebookRow[] = []
  data.forEach((record, index) => {
    if (blank(record)) return
    const read = readRow(index + 1, record, header, fail)
    if (read) rows.push(read)
  })
  return { rows, errors }
}

/** One data row; undefined when it has no usable label (nothing else can refer to it then). */
function readRow(row: number, record: string[], header: string[], fail: (row: number, column: CodebookCsvColumn | null, message: string) => void): CodebookRow | undefined {
  if (record.length > header.length) {
    fail(row, null, `Row ${row} has ${record.length} cells, but the header names ${header.length} columns.`)
    return undefined
  }
  const has = (column: CodebookCsvColumn) => header.includes(column)
  const cell = (column: CodebookCsvColumn) => normaliseCellText(restoreFormula(record[header.indexOf(column)] ?? ''))
  const label = cell('label').trim()
  if (label === '') return void fail(row, 'label', `Row ${row}: the label is empty; every code needs one.`)
  if (label.length > 80) return void fail(row, 'label', `Row ${row}: the label has ${label.length} characters; a code label has at most 80.`)
  if (/[\p{Cc}<>]/u.test(label)) {
    return void fail(row, 'label', `Row ${row}: the label “${label.replace(/\p{Cc}/gu, '')}” has a < or > or an invisible control character; use letters, digits, spaces and ordinary punctuation.`)
  }

  const read: CodebookRow = { row, label, faulty: false }
  const flaw = (column: CodebookCsvColumn, message: string) => {
    fail(row, column, `Row ${row}: ${message}`)
    read.faulty = true
  }
  if (has('parent')) read.parent = cell('parent').trim() || null
  for (const { field, column, words, max } of TEXT_FIELDS) {
    if (!has(column)) continue
    const value = cell(column)
    if (value.length > max) flaw(column, `the ${words} has ${value.length} characters; at most ${max} are allowed.`)
    else if (value.includes('\u0000')) flaw(column, `the ${words} holds an invisible NUL character; remove it.`)
    read[field] = value
  }
  if (has('colour')) {
    const value = cell('colour').trim()
    read.colour = value === '' ? null : colourFromCell(value)
    if (read.colour === null && value !== '') {
      flaw('colour', `“${value}” is not one of the eight code colours (${OKABE_ITO.map((colour) => colour.name).join(', ')}, or their hex codes).`)
    }
  }
  if (has('status')) {
    const value = cell('status').trim().toLowerCase()
    if (value === '' || value === 'active' || value === 'retired') read.status = value === '' ? 'active' : value
    else if (value === 'merged') flaw('status', `an import cannot merge codes: merge “${label}” in the codebook instead, or write active or retired.`)
    else flaw('status', `the status “${value}” is neither active nor retired.`)
  }
  return read
}
