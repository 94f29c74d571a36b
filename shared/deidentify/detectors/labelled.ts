// Numbers introduced by a label: "MRN 00482913", "policy number PL-2290118", "VIN 1HW4…".
// The label decides the category (Safe Harbor (G)–(M)); the number itself can have any shape.
import { candidate, type Candidate, type IdentifierCategory } from '../categories.js'
import { RANK } from './patterns.js'

const LABELS: [IdentifierCategory, string[]][] = [
  ['ssn', ['social security number', 'social security no', 'social security', 'ssn']],
  ['record-number', ['medical record number', 'medical record no', 'medical record', 'mrn', 'hospital number',
    'hospital no', 'chart number', 'chart no', 'chart', 'patient number', 'patient no', 'patient id']],
  ['health-plan-number', ['health plan beneficiary number', 'health plan number', 'health plan id', 'health plan',
    'member id', 'member number', 'membership number', 'policy number', 'policy no', 'policy', 'insurance number',
    'insurance id', 'medicare number', 'medicaid number', 'medicare', 'medicaid', 'health card number', 'health card',
    'nhs number', 'nhs no', 'beneficiary number', 'group number']],
  ['account-number', ['bank account', 'billing account', 'account number', 'account no', 'account', 'acct']],
  ['vehicle-id', ['licence plate', 'license plate', 'number plate', 'plate number', 'plate',
    'vehicle identification number', 'vin', 'registration number', 'registration', 'reg']],
  ['licence-number', ["driver's licence", "driver's license", 'drivers licence', 'drivers license', "driver’s licence",
    "driver’s license", 'driving licence', 'driving license', 'licence number', 'license number', 'licence no',
    'license no', 'certificate number', 'permit number']],
  ['device-id', ['pacemaker serial', 'hearing aid serial', 'device serial', 'serial number', 'serial no', 'serial',
    'device id', 'device number', 'imei']],
]

const CATEGORY_OF = new Map<string, IdentifierCategory>()
for (const [category, labels] of LABELS) for (const label of labels) CATEGORY_OF.set(label.replace('’', "'"), category)

const LABEL = new RegExp(
  `\\b(?:${[...CATEGORY_OF.keys()].sort((a, b) => b.length - a.length).map((l) => l.replace(/'/g, "['’]").replace(/ /g, '\\s+')).join('|')})\\b`,
  'gi',
)
// Between label and number: punctuation, "#", and at most six lower-case words ("number for the bill is").
const FILLER = /(?:[\s:#,.()—–'’-]|\b[a-z]+(?:['’][a-z]+)?\b){0,16}/y
// Upper-case letters and digits in groups joined by "-", "/" or single spaces (space-joined groups ≥ 2 characters).
const IDENTIFIER = /[A-Z0-9](?:[A-Z0-9]|[-/](?=[A-Z0-9])|\s(?=[A-Z0-9]{2,}(?![a-z])))*(?![\w-])/y

function wordsIn(filler: string): number {
  return (filler.match(/[a-z]+/gi) ?? []).length
}

function plausibleIdentifier(id: string): boolean {
  const digits = (id.match(/\d/g) ?? []).length
  const letters = (id.match(/[A-Z]/g) ?? []).length
  if (/^(1[89]|20)\d\d$/.test(id)) return false // a bare year
  return digits >= 3 || (digits >= 2 && letters >= 2)
}

export function detectLabelledNumbers(text: string): Candidate[] {
  const found: Candidate[] = []
  for (const m of text.matchAll(LABEL)) {
    const category = CATEGORY_OF.get(m[0].toLowerCase().replace(/\s+/g, ' ').replace('’', "'"))
    if (!category) continue
    FILLER.lastIndex = m.index + m[0].length
    const filler = FILLER.exec(text)?.[0] ?? ''
    if (wordsIn(filler) > 6) continue
    IDENTIFIER.lastIndex = m.index + m[0].length + filler.length
    const id = IDENTIFIER.exec(text)
    if (!id || !plausibleIdentifier(id[0])) continue
    found.push(candidate(text, id.index, id.index + id[0].length, category, RANK.labelled))
  }
  return found
}
