/**
 * Reads the entry names from a zip's central directory without decompressing anything, synchronously, so
 * the format can be decided from content alone. Layout per the ZIP application note (PKWARE APPNOTE 4.3.16,
 * 4.3.12): end-of-central-directory record, then fixed-size file headers. Returns null when the directory
 * cannot be found or is malformed.
 */
const END_OF_DIRECTORY = 0x06054b50
const DIRECTORY_HEADER = 0x02014b50
const MAX_COMMENT = 0xffff

export function isZip(buffer: Buffer): boolean {
  return buffer.length >= 4 && buffer[0] === 0x50 && buffer[1] === 0x4b && (buffer[2] === 3 || buffer[2] === 5) && (buffer[3] === 4 || buffer[3] === 6)
}

export function zipEntryNames(buffer: Buffer): string[] | null {
  let end = -1
  for (let i = buffer.length - 22; i >= Math.max(0, buffer.length - 22 - MAX_COMMENT); i--) {
    if (buffer.readUInt32LE(i) === END_OF_DIRECTORY) {
      end = i
      break
    }
  }
  if (end < 0) return null
  const count = buffer.readUInt16LE(end + 10)
  let at = buffer.readUInt32LE(end + 16)
  const names: string[] = []
  for (let k = 0; k < count; k++) {
    if (at + 46 > buffer.length || buffer.readUInt32LE(at) !== DIRECTORY_HEADER) return null
    const nameLength = buffer.readUInt16LE(at + 28)
    const extraLength = buffer.readUInt16LE(at + 30)
    const commentLength = buffer.readUInt16LE(at + 32)
    if (at + 46 + nameLength > buffer.length) return null
    names.push(buffer.toString('utf8', at + 46, at + 46 + nameLength))
    at += 46 + nameLength + extraLength + commentLength
  }
  return names
}
