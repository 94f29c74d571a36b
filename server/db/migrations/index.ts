import { Foundation1796149782369 } from './1796149782369-Foundation.js'
import { Recruitment1796151704694 } from './1796151704694-Recruitment.js'
import { Consent1796152773826 } from './1796152773826-Consent.js'

/** Every migration class in order; listed, never globbed. */
export const migrations = [Foundation1796149782369, Recruitment1796151704694, Consent1796152773826]
