import { createHash, createHmac } from 'node:crypto'

export function sha256(data: string | Buffer): string {
  return createHash('sha256').update(data).digest('hex')
}

/** A keyed hash, so a stored value (e.g. a network address) cannot be looked up by guessing. */
export function keyedHash(secret: string, data: string): string {
  return createHmac('sha256', secret).update(data).digest('hex')
}
