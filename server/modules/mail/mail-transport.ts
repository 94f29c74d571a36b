import nodemailer, { type Transporter } from 'nodemailer'

/** nodemailer over SMTP, with explicit time-outs (nodemailer has no retry of its own: the worker retries). */
export function createMailTransport(smtpUrl: string): Transporter {
  const url = new URL(smtpUrl)
  const secure = url.protocol === 'smtps:'
  return nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port || (secure ? 465 : 587)),
    secure,
    ignoreTLS: url.searchParams.get('ignoreTLS') === 'true',
    requireTLS: url.searchParams.get('requireTLS') === 'true',
    auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
}
