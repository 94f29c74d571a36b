import type { Response } from 'express'
import Papa from 'papaparse'

/**
 * CSV downloads: papaparse writes the file, every cell is neutralised against spreadsheet formulas
 * (OWASP "CSV Injection": a cell starting with = + - @ tab or carriage return gets a leading
 * apostrophe), and an optional byte-order mark lets spreadsheet programs read UTF-8.
 */
export function safeCell(value: unknown): string {
  const text = value === null || value === undefined ? '' : String(value)
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text
}

export function toCsv(fields: string[], rows: unknown[][], options: { bom?: boolean } = {}): string {
  const body = Papa.unparse({ fields, data: rows.map((row) => row.map(safeCell)) }, { quotes: false, newline: '\r\n' })
  return (options.bom ? '\uFEFF' : '') + body + '\r\n'
}

/** Rows only (no header line), each ending in CRLF: for exports written piece by piece. */
export function csvRows(rows: unknown[][]): string {
  if (!rows.length) return ''
  return Papa.unparse(rows.map((row) => row.map(safeCell)), { quotes: false, newline: '\r\n' }) + '\r\n'
}

/** RFC 6266 attachment with an ASCII fallback name and the UTF-8 one. */
export function attachment(filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_')
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`
}

export function sendCsv(res: Response, filename: string, body: string): void {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8')
  res.setHeader('Content-Disposition', attachment(filename))
  res.send(body)
}
