import { randomBytes } from 'node:crypto'
import pg from 'pg'
import PgBoss from 'pg-boss'
import request from 'supertest'
import { inject } from 'vitest'
import type { DataSource } from 'typeorm'
import { createApp } from '../../server/app.js'
import { loadConfig, type Config } from '../../server/config.js'
import { createDataSource } from '../../server/db/data-source.js'
import { BOSS_SCHEMA } from '../../server/db/migrate.js'
import { createLogger } from '../../server/lib/logger.js'
import { createMailTransport } from '../../server/modules/mail/mail-transport.js'
import { MailService } from '../../server/modules/mail/mail.service.js'
import { startMailWorker } from '../../server/modules/mail/mail-worker.js'
import { ObjectStore } from '../../server/storage/object-store.js'

export interface TestContext {
  app: ReturnType<typeof createApp>
  dataSource: DataSource
  config: Config
  databaseUrl: string
  boss: PgBoss
  storage: ObjectStore
  /** starts the outbox worker (off by default so tests decide when mail goes out) */
  startMailWorker(smtpUrl?: string): Promise<void>
  close(): Promise<void>
}

/** A fresh database cloned from the migrated template, and the app built on it. */
export async function createTestContext(overrides: Record<string, string> = {}): Promise<TestContext> {
  const port = inject('pgPort')
  // A second app instance on the same database is made by passing that DATABASE_URL.
  let databaseUrl = overrides.DATABASE_URL
  if (!databaseUrl) {
    const name = `t_${randomBytes(6).toString('hex')}`
    const admin = new pg.Client({ host: '127.0.0.1', port, user: 'postgres', database: 'postgres' })
    await admin.connect()
    await admin.query(`CREATE DATABASE ${name} TEMPLATE app_template`)
    await admin.end()
    databaseUrl = `postgres://postgres@127.0.0.1:${port}/${name}`
  }
  const config = loadConfig({
    NODE_ENV: 'test',
    SESSION_SECRET: 'test-secret-that-is-long-enough-for-the-config',
    PUBLIC_URL: 'http://127.0.0.1:3000',
    S3_ENDPOINT: inject('s3Endpoint'),
    S3_BUCKET: 'heardwell-test',
    S3_ACCESS_KEY_ID: 'S3RVER',
    S3_SECRET_ACCESS_KEY: 'S3RVER',
    S3_FORCE_PATH_STYLE: 'true',
    SMTP_URL: inject('smtpUrl'),
    LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
    CLIENT_DIST: process.env.TEST_CLIENT_DIST ?? 'dist',
    ...overrides,
    DATABASE_URL: databaseUrl,
  })
  const log = createLogger(config.LOG_LEVEL)
  const dataSource = await createDataSource(databaseUrl, { poolSize: 5, logging: false }).initialize()
  const boss = new PgBoss({ connectionString: databaseUrl, schema: BOSS_SCHEMA, max: 2, migrate: false, supervise: false, schedule: false })
  boss.on('error', () => {})
  await boss.start()
  const storage = new ObjectStore({
    endpoint: config.S3_ENDPOINT,
    region: config.S3_REGION,
    bucket: config.S3_BUCKET,
    accessKeyId: config.S3_ACCESS_KEY_ID,
    secretAccessKey: config.S3_SECRET_ACCESS_KEY,
    forcePathStyle: true,
  })
  const mailTransport = createMailTransport(config.SMTP_URL!)
  const app = createApp({ config, dataSource, storage, boss, mailTransport, log, mailboxDir: inject('mailboxDir') })
  const transports = [mailTransport]
  return {
    app,
    dataSource,
    config,
    databaseUrl,
    boss,
    storage,
    async startMailWorker(smtpUrl = config.SMTP_URL!) {
      const transport = createMailTransport(smtpUrl)
      transports.push(transport)
      await startMailWorker(boss, new MailService(dataSource, boss, config.MAIL_FROM, log, storage), transport)
    },
    async close() {
      await boss.stop({ graceful: false, wait: true, timeout: 2000 })
      for (const t of transports) t.close()
      await dataSource.destroy()
    },
  }
}

/** A supertest agent that keeps cookies and sends the CSRF token on every state-changing request. */
export class Client {
  readonly agent: ReturnType<typeof request.agent>
  csrf = ''

  constructor(app: TestContext['app']) {
    this.agent = request.agent(app)
  }

  async refreshCsrf(): Promise<string> {
    const res = await this.agent.get('/api/auth/csrf').expect(200)
    this.csrf = res.body.token
    return this.csrf
  }

  async signIn(email: string, password: string) {
    if (!this.csrf) await this.refreshCsrf()
    const res = await this.agent.post('/api/auth/login').set('X-CSRF-Token', this.csrf).send({ email, password })
    if (res.headers['x-csrf-token']) this.csrf = res.headers['x-csrf-token']
    return res
  }

  get(path: string) {
    return this.agent.get(path)
  }
  post(path: string, body?: object) {
    return this.agent.post(path).set('X-CSRF-Token', this.csrf).send(body)
  }
  patch(path: string, body?: object) {
    return this.agent.patch(path).set('X-CSRF-Token', this.csrf).send(body)
  }
  put(path: string, body?: object) {
    return this.agent.put(path).set('X-CSRF-Token', this.csrf).send(body)
  }
  delete(path: string) {
    return this.agent.delete(path).set('X-CSRF-Token', this.csrf)
  }
}
