import { describe, expect, it } from 'vitest'
import Papa from 'papaparse'
import { csvRows, safeCell, toCsv } from '../../server/lib/csv.js'

/** The CSV every export writes: RFC 4180 quoting through papaparse, read back by papaparse. */
describe('CSV exports', () => {
  const tricky = ['comma, inside', 'a "quoted" word', 'two\nlines', 'CRLF\r\ntoo', '東京の兄', 'Σπίτι', 'مرحبا', '😀 emoji', '']

  it('round-trips commas, quotes, new lines and non-Latin text (RFC 4180 §2)', () => {
    const csv = toCsv(['a', 'b', 'c'], [tricky.slice(0, 3), tricky.slice(3, 6), tricky.slice(6, 9)], { bom: true })
    expect(csv.startsWith('\uFEFF')).toBe(true) // byte-order mark: spreadsheet programs then read UTF-8 (Unicode Standard §23.8, from memory)
    const back = Papa.parse<string[]>(csv.slice(1), { skipEmptyLines: true }).data
    expect(back).toEqual([['a', 'b', 'c'], tricky.slice(0, 3), tricky.slice(3, 6), tricky.slice(6, 9)])
  })

  it('writes rows piece by piece that read back as one file', () => {
    const csv = toCsv(['x', 'y'], []) + csvRows([['1', 'one, two']]) + csvRows([['2', 'three\nfour']])
    expect(Papa.parse<string[]>(csv, { skipEmptyLines: true }).data).toEqual([['x', 'y'], ['1', 'one, two'], ['2', 'three\nfour']])
  })

  it('neutralises cells a spreadsheet would run as formulas (OWASP, CSV Injection)', () => {
    for (const cell of ['=1+1', '+1', '-1', '@SUM(A1)', '\tx', '\rx']) expect(safeCell(cell)).toBe(`'${cell}`)
    expect(safeCell('plain = fine')).toBe('plain = fine')
  })
})
