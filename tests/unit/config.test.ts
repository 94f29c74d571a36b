import { describe, expect, it } from 'vitest'
import { loadConfig } from '../../server/config.js'

const base = { DATABASE_URL: 'postgres://x@127.0.0.1:5432/x', SESSION_SECRET: 's'.repeat(40) }

describe('configuration', () => {
  it('stops start-up with a message naming each missing variable', () => {
    expect(() => loadConfig({})).toThrow(/DATABASE_URL[\s\S]*SESSION_SECRET/)
  })

  it('in production, refuses to stand the local fakes or the demo data in for real services', () => {
    expect(() => loadConfig({ ...base, NODE_ENV: 'production' })).toThrow(/S3_ENDPOINT is required[\s\S]*SMTP_URL is required/)
    expect(() =>
      loadConfig({ ...base, NODE_ENV: 'production', S3_ENDPOINT: 'https://s3.example.org', SMTP_URL: 'smtps://mail.example.org', SEED_DEMO: 'true' }),
    ).toThrow(/demo data is refused/)
    const ok = loadConfig({ ...base, NODE_ENV: 'production', S3_ENDPOINT: 'https://s3.example.org', SMTP_URL: 'smtps://mail.example.org' })
    expect(ok.SEED_DEMO).toBe(false)
    expect(Object.isFrozen(ok)).toBe(true)
  })
})
