// Names (Safe Harbor (A)) and places smaller than a state ((B)) found with compromise: its people()
// and places(), plus two match patterns for how interviewees introduce people and places —
// a role or kin word before a proper noun ("my daughter Imogen", "the assessor, Philippa Grange")
// and a preposition before one ("came from Thornbeck", "lives in Kettle Ford").
import nlp from 'compromise'
import { candidate, type Candidate } from '../categories.js'
import { RANK } from './patterns.js'
import { taggableSpans } from './sentences.js'

interface TermJson { text: string; post?: string; tags?: string[]; offset: { start: number; length: number } }
interface MatchJson { terms: TermJson[] }
/** The one thing used from a compromise selection. */
interface View { json(options: object): unknown }

const ROLES = '(mum|mom|mother|dad|father|sister|brother|son|daughter|husband|wife|partner|grandson|granddaughter|' +
  'grandma|grandpa|nan|uncle|aunt|auntie|niece|nephew|cousin|friend|neighbour|neighbor|carer|caregiver|nurse|doctor|' +
  'consultant|therapist|physio|worker|assessor|driver|engineer|manager|assistant|clerk|matron|surgeon|pharmacist|' +
  'receptionist|chaplain|volunteer|called|named|#Actor)'
const INTRODUCED_NAME = `${ROLES} ,? (is|was|called|named)? [#ProperNoun+]`
const PLACE_AFTER_PREPOSITION = '(in|from|near|at|to|outside|around|towards|into) the? [#ProperNoun+]'
// Parts of a hospital or service, not places ("the Stroke Unit", "Ward 7").
const NOT_A_PLACE = /^(?:Unit|Ward|Team|Department|Service|Services|Bay|Clinic|Trust|Council|Group)$/
const US_STATE_OR_COUNTRY = ['Country', 'Region']
const POSSESSIVE = /['’]s$/

const PARTICLES = /^(?:of|on|upon|the|de|da|del|van|von|le|la)$/
const isCapitalised = (t: TermJson) => /^\p{Lu}/u.test(t.text)
const isStateOrCountry = (t: TermJson) => US_STATE_OR_COUNTRY.some((tag) => t.tags?.includes(tag))

/**
 * The proper-name core of a match: lower-case words at either end go ("sister Bethan" → "Bethan"),
 * and so do states and countries, which Safe Harbor keeps ("Kettle Ford, Montana" → "Kettle Ford").
 */
function properCore(terms: TermJson[], category: 'name' | 'location'): TermJson[] {
  const drop = (t: TermJson) => !isCapitalised(t) || (category === 'location' && isStateOrCountry(t))
  let from = 0
  let to = terms.length
  while (from < to && drop(terms[from])) from++
  while (to > from && drop(terms[to - 1])) to--
  const core = terms.slice(from, to)
  return core.every((t) => isCapitalised(t) || PARTICLES.test(t.text)) ? core : []
}

/** Splits a match after each comma ("Agnes, Bethan" → two names), as compromise's people() does. */
function splitAtCommas(terms: TermJson[]): TermJson[][] {
  const parts: TermJson[][] = [[]]
  for (const t of terms) {
    parts[parts.length - 1].push(t)
    if (t.post?.includes(',')) parts.push([])
  }
  return parts.filter((p) => p.length > 0)
}

/** `firstOnly`: a cue word introduces only the first of a comma list ("from Eastbrook, Ines Carrow"). */
function toCandidates(text: string, offset: number, view: View, category: 'name' | 'location', rank: number, firstOnly = false): Candidate[] {
  const matches = view.json({ offset: true, terms: { offset: true, tags: true } }) as MatchJson[]
  const found: Candidate[] = []
  for (const part of matches.flatMap((m) => splitAtCommas(m.terms).slice(0, firstOnly ? 1 : undefined))) {
    const terms = properCore(part, category)
    const first = terms[0]
    const last = terms[terms.length - 1]
    if (!first || !last) continue
    if (terms.some((t) => t.tags?.includes('Date'))) continue // dates are someone else's job
    if (category === 'location' && NOT_A_PLACE.test(last.text.replace(POSSESSIVE, ''))) continue
    if (terms.length === 1 && /^[A-Z&]{2,5}$/.test(first.text)) continue // acronyms: GP, HR, TIA
    const start = offset + first.offset.start
    let end = offset + last.offset.start + last.offset.length
    if (POSSESSIVE.test(text.slice(start, end))) end -= 2
    found.push(candidate(text, start, end, category, rank))
  }
  return found
}

export function detectPeopleAndPlaces(text: string): Candidate[] {
  const found: Candidate[] = []
  for (const [start, end] of taggableSpans(text)) {
    const doc = nlp(text.slice(start, end))
    found.push(
      // The same selection as doc.people(), which splits the whole document at commas first and is slow.
      ...toCandidates(text, start, doc.match('#Honorific+? #Person+'), 'name', RANK.nlp),
      ...toCandidates(text, start, doc.places(), 'location', RANK.nlp),
      ...toCandidates(text, start, doc.match(INTRODUCED_NAME, 0), 'name', RANK.introducedName, true),
      ...toCandidates(text, start, doc.match(PLACE_AFTER_PREPOSITION, 0), 'location', RANK.placeAfterPreposition, true),
    )
  }
  return found
}
