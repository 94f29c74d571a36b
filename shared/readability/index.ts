export { READABILITY_GUIDANCE, countSyllables, countWords, fleschKincaidGrade, fleschReadingEase, readability } from './flesch.js'
export type { Readability, TextCounts } from './flesch.js'
