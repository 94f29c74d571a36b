import type { Response } from 'express'

/** Sends a stored file as a download: attachment, exact type, RFC 6266 file name, sandboxed (ASVS 5.0 3.2.1, 5.4.1). */
export function sendDownload(res: Response, file: { name: string; contentType: string; body: Buffer }) {
  const ascii = file.name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_')
  res.setHeader('Content-Type', file.contentType)
  res.setHeader('Content-Disposition', `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(file.name)}`)
  res.setHeader('Content-Security-Policy', "sandbox; default-src 'none'")
  res.send(file.body)
}
