/**
 * A throw-away Heardwell for benchmarks: its own PostgreSQL cluster, a migrated database with the demo
 * study, the fake S3 server, the app and a bare Express baseline on loopback ports. Everything is
 * removed again by `close()`.
 */
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import type { Server } from 'node:http'
import express from 'express'
import pg from 'pg'
import PgBoss from 'pg-boss'
import type { DataSource } from 'typeorm'
import { ensureCluster, ensurePostgresInstalled, freePort, stopCluster } from '../lib/postgres.mjs'
import { createApp } from '../../server/app.js'
import { loadConfig } from '../../server/config.js'
import { createDataSource } from '../../server/db/data-source.js'
import { BOSS_SCHEMA, migrateDatabase } from '../../server/db/migrate.js'
import { startFakeS3 } from '../../server/fakes/fake-s3.js'
import { createLogger } from '../../server/lib/logger.js'
import { createMailTransport } from '../../server/modules/mail/mail-transport.js'
import { seedDemo } from '../../server/seed/demo.js'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { ObjectStore } from '../../server/storage/object-store.js'
import { signIn as signInOn, type Session } from './bench-clients.js'

export interface BenchEnvironment {
  appPort: number
  basePort: number
  dataSource: DataSource
  storage: ObjectStore
  studyId: string
  databaseUrl: string
  /** signs in and returns the session cookie and the CSRF token for writes */
  signIn(email: string, password?: string): Promise<Session>
  close(): Promise<void>
}

export async function startBenchEnvironment(options: { clientDist?: string } = {}): Promise<BenchEnvironment> {
  const workDir = mkdtempSync(path.join(tmpdir(), 'heardwell-bench-'))
  const bin = ensurePostgresInstalled()
  const pgPort = await freePort()
  await ensureCluster({ bin, dataDir: path.join(workDir, 'pg'), port: pgPort, fast: true, log: () => {} })
  const cleanup: (() => Promise<void> | void)[] = [() => stopCluster({ bin, dataDir: path.join(workDir, 'pg') }), () => rmSync(workDir, { recursive: true, force: true })]
  const close = async () => {
    for (const step of cleanup.reverse()) await step()
  }
  try {
    if (process.env.BENCH_STATEMENTS) await preloadStatementStatistics(bin, path.join(workDir, 'pg'), pgPort)
    const admin = new pg.Client({ host: '127.0.0.1', port: pgPort, user: 'postgres', database: 'postgres' })
    await admin.connect()
    await admin.query('CREATE DATABASE bench')
    await admin.end()
    if (process.env.BENCH_STATEMENTS) {
      const bench = new pg.Client({ host: '127.0.0.1', port: pgPort, user: 'postgres', database: 'bench' })
      await bench.connect()
      await bench.query('CREATE EXTENSION IF NOT EXISTS pg_stat_statements')
      await bench.end()
    }
    const s3 = await startFakeS3(path.join(workDir, 's3'), 'bench')
    cleanup.push(() => s3.close())
    const url = `postgres://postgres@127.0.0.1:${pgPort}/bench`
    const config = loadConfig({
      NODE_ENV: 'test',
      DATABASE_URL: url,
      SESSION_SECRET: 'bench-secret-bench-secret-bench-secret',
      LOG_LEVEL: 'silent',
      S3_ENDPOINT: s3.endpoint,
      S3_BUCKET: 'bench',
      S3_ACCESS_KEY_ID: s3.accessKeyId,
      S3_SECRET_ACCESS_KEY: s3.secretAccessKey,
      SMTP_URL: 'smtp://127.0.0.1:9',
      CLIENT_DIST: options.clientDist ?? path.join(workDir, 'no-client'),
      LOGIN_FAILURES_PER_ADDRESS: '10000',
    })
    const dataSource = await createDataSource(url, { logging: false, poolSize: 20 }).initialize()
    cleanup.push(() => dataSource.destroy())
    await migrateDatabase(dataSource, url)
    const storage = new ObjectStore({ endpoint: config.S3_ENDPOINT, region: config.S3_REGION, bucket: config.S3_BUCKET, forcePathStyle: true, accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey })
    const { studyId } = await seedDemo(dataSource, 'test', undefined, storage)
    const boss = new PgBoss({ connectionString: url, schema: BOSS_SCHEMA, migrate: false, supervise: false, schedule: false })
    boss.on('error', () => {})
    await boss.start()
    cleanup.push(() => boss.stop({ graceful: false, wait: true }))
    const app = createApp({ config, dataSource, storage, boss, mailTransport: createMailTransport(config.SMTP_URL!), log: createLogger('silent') })
    // the baseline: a bare Express app answering JSON, no session, no database
    const baseline = express()
      .use(express.json())
      .get('/plain', (_req, res) => res.json({ ok: true }))
      .post('/plain', (req, res) => res.status(201).json({ ok: true, size: JSON.stringify(req.body).length }))
      // n CSV rows written from memory, in chunks, as a streaming baseline
      .get('/rows', async (req, res) => {
        const n = Math.min(Number(req.query.n) || 0, 200_000)
        res.setHeader('Content-Type', 'text/csv; charset=utf-8')
        const line = 'Bench theme,draft,P01,,"The first week was the hardest, the stairs and the bathroom."\r\n'
        for (let i = 0; i < n; i += 500) if (!res.write(line.repeat(Math.min(500, n - i)))) await new Promise((r) => res.once('drain', r))
        res.end()
      })
    const servers: Server[] = await Promise.all([app, baseline].map((a) => new Promise<Server>((resolve) => { const s = a.listen(0, '127.0.0.1', () => resolve(s)) })))
    cleanup.push(() => Promise.all(servers.map((s) => new Promise<void>((resolve) => { s.closeAllConnections(); s.close(() => resolve()) }))).then(() => {}))
    const [appPort, basePort] = servers.map((s) => (s.address() as { port: number }).port) as [number, number]

    const signIn = (email: string, password = DEMO_PASSWORD) => signInOn(appPort, email, password)
    return { appPort, basePort, dataSource, storage, studyId, databaseUrl: url, signIn, close }
  } catch (error) {
    await close()
    throw error
  }
}

/**
 * BENCH_STATEMENTS=1: the cluster restarted with pg_stat_statements loaded (it must be preloaded at
 * start), so a benchmark can print which statements cost PostgreSQL the most.
 */
async function preloadStatementStatistics(bin: string, dataDir: string, port: number): Promise<void> {
  const admin = new pg.Client({ host: '127.0.0.1', port, user: 'postgres', database: 'postgres' })
  await admin.connect()
  try {
    await admin.query(`ALTER SYSTEM SET shared_preload_libraries = 'pg_stat_statements'`)
  } finally {
    await admin.end()
  }
  stopCluster({ bin, dataDir })
  await ensureCluster({ bin, dataDir, port, fast: true, log: () => {} })
  // the module's own settings exist only once it is loaded
  const loaded = new pg.Client({ host: '127.0.0.1', port, user: 'postgres', database: 'postgres' })
  await loaded.connect()
  try {
    await loaded.query(`ALTER SYSTEM SET pg_stat_statements.track = 'all'`)
    await loaded.query(`ALTER SYSTEM SET pg_stat_statements.track_planning = on`)
    await loaded.query('SELECT pg_reload_conf()')
  } finally {
    await loaded.end()
  }
}
