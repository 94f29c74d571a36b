import { Foundation1796149782369 } from './1796149782369-Foundation.js'

/** Every migration class in order; listed, never globbed. */
export const migrations = [Foundation1796149782369]
