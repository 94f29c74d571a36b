import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import pg from 'pg'
import type { TestProject } from 'vitest/node'
import { ensureCluster, ensurePostgresInstalled, freePort, stopCluster } from '../../scripts/lib/postgres.mjs'
import { createDataSource } from '../../server/db/data-source.js'
import { migrateDatabase } from '../../server/db/migrate.js'
import { startFakeS3 } from '../../server/fakes/fake-s3.js'
import { startFakeSmtp } from '../../server/fakes/fake-smtp.js'

export const TEMPLATE_DB = 'app_template'

declare module 'vitest' {
  export interface ProvidedContext {
    pgPort: number
    s3Endpoint: string
    smtpUrl: string
    smtpPort: number
    mailboxDir: string
    workDir: string
  }
}

/**
 * Starts a throw-away PostgreSQL cluster (fsync off) on a free loopback port, migrates a template
 * database once (each test file clones it), and starts the fake S3 and SMTP servers. Nothing here
 * touches the `npm start` data under .data/.
 */
export default async function setup(project: TestProject) {
  const workDir = mkdtempSync(path.join(tmpdir(), 'heardwell-test-'))
  const bin = ensurePostgresInstalled()
  const port = await freePort()
  const dataDir = path.join(workDir, 'pg')
  await ensureCluster({ bin, dataDir, port, fast: true, log: () => {} })

  const admin = new pg.Client({ host: '127.0.0.1', port, user: 'postgres', database: 'postgres' })
  await admin.connect()
  await admin.query(`CREATE DATABASE ${TEMPLATE_DB}`)
  await admin.end()
  const url = `postgres://postgres@127.0.0.1:${port}/${TEMPLATE_DB}`
  const dataSource = await createDataSource(url).initialize()
  await migrateDatabase(dataSource, url)
  await dataSource.destroy()

  const s3 = await startFakeS3(path.join(workDir, 's3'), 'heardwell-test')
  const mailboxDir = path.join(workDir, 'mail')
  const smtp = await startFakeSmtp(mailboxDir)

  project.provide('pgPort', port)
  project.provide('s3Endpoint', s3.endpoint)
  project.provide('smtpUrl', smtp.url)
  project.provide('smtpPort', smtp.port)
  project.provide('mailboxDir', mailboxDir)
  project.provide('workDir', workDir)

  return async () => {
    await smtp.close()
    await s3.close()
    stopCluster({ bin, dataDir })
    rmSync(workDir, { recursive: true, force: true })
  }
}
