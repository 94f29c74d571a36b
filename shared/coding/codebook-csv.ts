import Papa from 'papaparse'
import type { CodeStatus } from '../schemas/coding.js'
import {
  CODEBOOK_CSV_COLUMNS,
  colourFromCell,
  labelKey,
  neutraliseFormula,
  normaliseCellText,
  readCodebookRows,
  type CodebookCsvColumn,
  type CodebookImportError,
  type CodebookRow,
  type ImportableStatus,
} from './codebook-csv-read.js'
import { buildCodeTree, flattenCodeTree } from './codebook-tree.js'

/**
 * The codebook as a CSV file for spreadsheet programs, and the plan for importing one: which codes
 * a file creates, which it changes, and every mistake in it, row by row. The server applies a plan
 * only when it has no errors, so an import is all or nothing.
 */

export {
  CODEBOOK_CSV_COLUMNS,
  MAX_IMPORT_ROWS,
  colourFromCell,
  labelKey,
  neutraliseFormula,
  normaliseCellText,
  restoreFormula,
  type CodebookCsvColumn,
  type CodebookImportError,
  type ImportableStatus,
} from './codebook-csv-read.js'

export interface CsvExportCode {
  id: string
  parentId: string | null
  position: number
  label: string
  definition: string
  whenToUse: string
  whenNotToUse: string
  colour: string
  status: CodeStatus
}

export interface ExistingCode {
  id: string
  label: string
  parentId: string | null
  definition: string
  whenToUse: string
  whenNotToUse: string
  colour: string
  status: CodeStatus
}

export interface PlannedCode {
  label: string
  /** another planned code's label or an existing code's label; null for a top-level code */
  parentLabel: string | null
  definition: string
  whenToUse: string
  whenNotToUse: string
  /** null: the file gives no colour, use the default */
  colour: string | null
  status: ImportableStatus
}

export interface PlannedUpdate {
  id: string
  changes: Partial<{
    parentLabel: string | null
    definition: string
    whenToUse: string
    whenNotToUse: string
    colour: string
    status: ImportableStatus
  }>
}

export interface CodebookImportPlan {
  /** parents come before their children, so they can be created in this order */
  creates: PlannedCode[]
  updates: PlannedUpdate[]
  unchanged: number
  errors: CodebookImportError[]
}

/** Merged codes are left out: their excerpts have moved, and an import cannot bring them back. */
export function codebookToCsv(codes: readonly CsvExportCode[], options: { bom?: boolean } = {}): string {
  const byId = new Map(codes.map((code) => [code.id, code]))
  const listed = flattenCodeTree(buildCodeTree(codes.filter((code) => code.status !== 'merged')))
  const data = listed.map(({ code }) => {
    const parent = code.parentId === null ? '' : (byId.get(code.parentId)?.label ?? '')
    return [code.label, parent, code.definition, code.whenToUse, code.whenNotToUse, code.colour, code.status].map(neutraliseFormula)
  })
  const body = Papa.unparse({ fields: [...CODEBOOK_CSV_COLUMNS], data }, { quotes: false, newline: '\r\n' })
  return `${options.bom ? '\uFEFF' : ''}${body}\r\n`
}

interface ResolvedRow extends CodebookRow {
  key: string
  /** the parent's key after the import; undefined when the file has no parent column (keep the parent) */
  parentKey?: string | null
}

/** The codebook as it is, looked up by id and by label. */
class Book {
  readonly byId: Map<string, ExistingCode>
  readonly byKey = new Map<string, ExistingCode>()

  constructor(codes: readonly ExistingCode[]) {
    this.byId = new Map(codes.map((code) => [code.id, code]))
    for (const code of codes) {
      const key = labelKey(code.label)
      const held = this.byKey.get(key)
      // A merged code may share a label with a live one; the live one is meant.
      if (!held || (held.status === 'merged' && code.status !== 'merged')) this.byKey.set(key, code)
    }
  }

  parentKeyOf(code: ExistingCode): string | null {
    const parent = code.parentId === null ? undefined : this.byId.get(code.parentId)
    return parent ? labelKey(parent.label) : null
  }
}

type Fail = (row: number, column: CodebookCsvColumn | null, message: string) => void

export function planCodebookImport(csv: string, existing: readonly ExistingCode[]): CodebookImportPlan {
  const { rows, errors } = readCodebookRows(csv)
  const plan: CodebookImportPlan = { creates: [], updates: [], unchanged: 0, errors }
  const book = new Book(existing)
  const bad = new Set<number>(rows.filter((row) => row.faulty).map((row) => row.row))
  const fail: Fail = (row, column, message) => {
    errors.push({ row, column, message })
    bad.add(row)
  }

  const file = new Map<string, ResolvedRow>()
  for (const row of rows) {
    const key = labelKey(row.label)
    const first = file.get(key)
    if (first) fail(row.row, 'label', `Row ${row.row}: the code “${row.label}” is already on row ${first.row}; list each code once.`)
    else file.set(key, { ...row, key })
  }
  for (const row of file.values()) resolveParent(row, file, book, fail)
  findLoops(file, book, bad, fail)

  const creates: PlannedCode[] = []
  for (const row of file.values()) {
    if (bad.has(row.row)) continue
    const match = book.byKey.get(row.key)
    if (!match) {
      creates.push({
        label: row.label,
        parentLabel: row.parent ?? null,
        definition: row.definition ?? '',
        whenToUse: row.whenToUse ?? '',
        whenNotToUse: row.whenNotToUse ?? '',
        colour: row.colour ?? null,
        status: row.status ?? 'active',
      })
      continue
    }
    const changes = changesOf(row, match, book)
    if (Object.keys(changes).length > 0) plan.updates.push({ id: match.id, changes })
    else plan.unchanged += 1
  }
  plan.creates = parentsFirst(creates)
  errors.sort((a, b) => a.row - b.row)
  return plan
}

/** Checks the row's code and parent against the file and the codebook, and notes the parent's key. */
function resolveParent(row: ResolvedRow, file: Map<string, ResolvedRow>, book: Book, fail: Fail): void {
  const match = book.byKey.get(row.key)
  if (match?.status === 'merged') {
    fail(row.row, 'label', `Row ${row.row}: “${match.label}” was merged into another code, so an import cannot change it; give the row another label.`)
  }
  if (row.parent === undefined || row.parent === null) {
    if (row.parent === null) row.parentKey = null
    return
  }
  const parentKey = labelKey(row.parent)
  if (parentKey === row.key) return fail(row.row, 'parent', `Row ${row.row}: “${row.label}” cannot be its own parent.`)
  const inFile = file.get(parentKey)
  const inBook = book.byKey.get(parentKey)
  if (!inFile && !inBook) return fail(row.row, 'parent', `Row ${row.row}: the parent “${row.parent}” is neither in this file nor in the codebook.`)
  row.parentKey = parentKey
  row.parent = inFile?.label ?? inBook!.label
  const sameParentAsNow = match !== undefined && book.parentKeyOf(match) === parentKey
  if (!inFile && inBook!.status === 'merged' && !sameParentAsNow) {
    fail(row.row, 'parent', `Row ${row.row}: the parent “${inBook!.label}” was merged into another code; choose another parent.`)
  }
}

/** Where every code would sit after the import; a walk up the parents that comes back to its start is a loop. */
function findLoops(file: Map<string, ResolvedRow>, book: Book, bad: Set<number>, fail: Fail): void {
  const parentAfter = new Map<string, string | null>()
  for (const code of book.byKey.values()) parentAfter.set(labelKey(code.label), book.parentKeyOf(code))
  for (const row of file.values()) if (row.parentKey !== undefined) parentAfter.set(row.key, row.parentKey)
  const looped = new Set<string>()
  for (const row of file.values()) {
    if (looped.has(row.key)) continue
    const chain = [row.key]
    let at = parentAfter.get(row.key) ?? null
    while (at !== null && at !== row.key && !chain.includes(at)) {
      chain.push(at)
      at = parentAfter.get(at) ?? null
    }
    if (at !== row.key) continue
    for (const key of chain) looped.add(key)
    const labels = [...chain, row.key].map((key) => `“${file.get(key)?.label ?? book.byKey.get(key)?.label ?? key}”`)
    fail(row.row, 'parent', `Row ${row.row}: these parents go round in a circle: ${labels.join(' › ')}.`)
    for (const key of chain) {
      const member = file.get(key)
      if (member) bad.add(member.row)
    }
  }
}

function changesOf(row: ResolvedRow, code: ExistingCode, book: Book): PlannedUpdate['changes'] {
  const changes: PlannedUpdate['changes'] = {}
  if (row.parentKey !== undefined && row.parentKey !== book.parentKeyOf(code)) changes.parentLabel = row.parent ?? null
  for (const field of ['definition', 'whenToUse', 'whenNotToUse'] as const) {
    const value = row[field]
    if (value !== undefined && value !== normaliseCellText(code[field])) changes[field] = value
  }
  if (row.colour && row.colour !== (colourFromCell(code.colour) ?? code.colour)) changes.colour = row.colour
  if (row.status !== undefined && row.status !== code.status) changes.status = row.status
  return changes
}

/** Orders new codes so a parent that is also new comes before its children. */
function parentsFirst(creates: PlannedCode[]): PlannedCode[] {
  const byKey = new Map(creates.map((planned) => [labelKey(planned.label), planned]))
  const ordered: PlannedCode[] = []
  const done = new Set<string>()
  const place = (planned: PlannedCode) => {
    const key = labelKey(planned.label)
    if (done.has(key)) return
    done.add(key)
    const parent = planned.parentLabel === null ? undefined : byKey.get(labelKey(planned.parentLabel))
    if (parent) place(parent)
    ordered.push(planned)
  }
  for (const planned of creates) place(planned)
  return ordered
}
