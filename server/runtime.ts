import 'reflect-metadata'
import path from 'node:path'
import type { Server } from 'node:http'
import PgBoss from 'pg-boss'
import type { Config } from './config.js'
import { createApp } from './app.js'
import { createDataSource } from './db/data-source.js'
import { BOSS_SCHEMA, ensureQueues, migrateDatabase } from './db/migrate.js'
import type { Logger } from './lib/logger.js'
import { createMailTransport } from './modules/mail/mail-transport.js'
import { startReminderWorker } from './modules/interviews/reminder-worker.js'
import { startRoundReminderWorker } from './modules/themes/reminder-worker.js'
import { buildServices } from './services.js'
import { purgeWithdrawnData, startPurgeSchedule } from './modules/transcripts/withdrawn-data-purge.js'
import { startMailWorker } from './modules/mail/mail-worker.js'
import { seedDemo } from './seed/demo.js'
import { ObjectStore } from './storage/object-store.js'

export interface Runtime {
  server: Server
  url: string
  stop(): Promise<void>
}

/**
 * Starts everything one app process needs: database, local fakes where no real service is configured,
 * the e-mail worker, and the HTTP server. `stop` undoes it in reverse order.
 */
export async function startRuntime(config: Config, log: Logger): Promise<Runtime> {
  const closers: (() => Promise<unknown>)[] = []
  const dataSource = createDataSource(config.DATABASE_URL, {
    onPoolError: (error) => log.warn({ err: error.message }, 'database connection lost; it will be re-opened on the next request'),
  })
  await dataSource.initialize()
  closers.push(() => dataSource.destroy())

  if (config.MIGRATE_ON_START) {
    const applied = await migrateDatabase(dataSource, config.DATABASE_URL)
    if (applied.length) log.info({ applied }, 'migrations applied')
  }

  const dataDir = path.resolve('.data')
  let s3 = { endpoint: config.S3_ENDPOINT, accessKeyId: config.S3_ACCESS_KEY_ID, secretAccessKey: config.S3_SECRET_ACCESS_KEY }
  if (!config.S3_ENDPOINT) {
    // loaded only when used: the fakes' packages are development dependencies
    const { startFakeS3 } = await import('./fakes/fake-s3.js')
    const fake = await startFakeS3(path.join(dataDir, 's3'), config.S3_BUCKET)
    closers.push(() => fake.close())
    s3 = fake
    log.info({ endpoint: fake.endpoint }, 'local object store started (fake S3)')
  }
  const storage = new ObjectStore({ ...s3, region: config.S3_REGION, bucket: config.S3_BUCKET, forcePathStyle: config.S3_FORCE_PATH_STYLE || !config.S3_ENDPOINT })
  await storage.ensureBucket()

  let smtpUrl = config.SMTP_URL
  let mailboxDir = config.MAILBOX_DIR
  if (!smtpUrl) {
    mailboxDir ??= path.join(dataDir, 'mail')
    const { startFakeSmtp } = await import('./fakes/fake-smtp.js')
    const fake = await startFakeSmtp(mailboxDir)
    closers.push(() => fake.close())
    smtpUrl = fake.url
    log.info({ url: fake.url }, 'local mail server started (fake SMTP); messages at /dev/mailbox')
  }
  const mailTransport = createMailTransport(smtpUrl)
  closers.push(async () => mailTransport.close())

  const boss = new PgBoss({ connectionString: config.DATABASE_URL, schema: BOSS_SCHEMA, max: 4, migrate: false })
  boss.on('error', (error: Error) => log.warn({ err: error.message }, 'job queue error'))
  await boss.start()
  await ensureQueues(boss)
  closers.push(() => boss.stop({ graceful: true, timeout: 5000, wait: true }))
  if (config.RUN_WORKER) {
    const services = buildServices({ config, dataSource, storage, boss, mailTransport, log })
    await startMailWorker(boss, services.mail, mailTransport)
    await startReminderWorker(boss, services.interviews)
    await startRoundReminderWorker(boss, services.reviewRounds)
    await startPurgeSchedule(boss, () => purgeWithdrawnData(dataSource, storage, services.audit))
  }

  if (config.SEED_DEMO) await seedDemo(dataSource, config.NODE_ENV, log, storage)

  const app = createApp({ config, dataSource, storage, boss, mailTransport, log, mailboxDir })
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(config.PORT, config.HOST, () => resolve(s))
    s.once('error', reject)
  })
  const address = server.address() as { port: number }
  const url = `http://${config.HOST}:${address.port}`
  return {
    server,
    url,
    async stop() {
      await new Promise<void>((resolve) => server.close(() => resolve()))
      for (const close of closers.reverse()) await close().catch((error) => log.warn({ err: String(error) }, 'while stopping'))
    },
  }
}
