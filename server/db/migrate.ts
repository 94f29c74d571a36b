import { ROUND_REMINDER_QUEUE } from '../modules/themes/review-round.service.js'
import type { DataSource } from 'typeorm'
import PgBoss from 'pg-boss'
import { MAIL_QUEUE, MAIL_MAX_ATTEMPTS } from '../modules/mail/mail.service.js'
import { REMINDER_QUEUE } from '../modules/interviews/interview.service.js'
import { PURGE_QUEUE } from '../modules/transcripts/withdrawn-data-purge.js'

export const BOSS_SCHEMA = 'pgboss'

/**
 * Brings a database up to date: our TypeORM migrations, then pg-boss's own schema (pg-boss keeps and
 * migrates its tables itself) and the queues the app uses.
 */
export async function migrateDatabase(dataSource: DataSource, databaseUrl: string): Promise<string[]> {
  const applied = await dataSource.runMigrations({ transaction: 'each' })
  const boss = new PgBoss({ connectionString: databaseUrl, schema: BOSS_SCHEMA, max: 1, supervise: false, schedule: false, migrate: true })
  boss.on('error', () => {})
  await boss.start()
  await ensureQueues(boss)
  await boss.stop({ graceful: false, wait: true })
  return applied.map((m) => m.name)
}

export async function ensureQueues(boss: PgBoss): Promise<void> {
  if (!(await boss.getQueue(MAIL_QUEUE))) {
    await boss.createQueue(MAIL_QUEUE, { name: MAIL_QUEUE, retryLimit: MAIL_MAX_ATTEMPTS - 1, retryBackoff: true, retryDelay: 5 })
  }
  if (!(await boss.getQueue(REMINDER_QUEUE))) {
    await boss.createQueue(REMINDER_QUEUE, { name: REMINDER_QUEUE, retryLimit: 5, retryBackoff: true, retryDelay: 30 })
  }
  if (!(await boss.getQueue(PURGE_QUEUE))) await boss.createQueue(PURGE_QUEUE, { name: PURGE_QUEUE, retryLimit: 3 })
  if (!(await boss.getQueue(ROUND_REMINDER_QUEUE))) await boss.createQueue(ROUND_REMINDER_QUEUE, { name: ROUND_REMINDER_QUEUE, retryLimit: 5, retryBackoff: true, retryDelay: 60 })
}
