/**
 * A whole Heardwell of its own for a fault drill: a throw-away PostgreSQL cluster (fsync off), the fake
 * S3 and fake SMTP servers, and the real server (`server/index.ts`) as a child process, so a drill can
 * stop and start each of them on the same port without touching the cluster the other test files share.
 * FAULT_DRILL_STDERR=1 passes the server's error output through, for looking into a failing drill.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, symlinkSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3'
import pg from 'pg'
import type { DataSource } from 'typeorm'
import { ensureCluster, ensurePostgresInstalled, freePort, stopCluster } from '../../../scripts/lib/postgres.mjs'
import { createDataSource } from '../../../server/db/data-source.js'
import { startFakeS3, type FakeS3 } from '../../../server/fakes/fake-s3.js'
import { startFakeSmtp, readMailbox, type FakeSmtp, type StoredMail } from '../../../server/fakes/fake-smtp.js'
import { TEST_PASSWORD } from '../../support/factories.js'
import { Client, type TestContext } from '../../support/test-app.js'

// the drill runs on the Node versions the project supports; the SDK's notice about future ones is noise here
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true'
const ROOT = path.resolve(import.meta.dirname, '../../..')
const BUCKET = 'heardwell-drill'
/** connections the drill itself opens carry this name, so "every app connection" can leave them out */
export const DRILL_APPLICATION_NAME = 'fault-drill'

export interface LogEntry {
  level: number
  msg: string
  err?: unknown
  [key: string]: unknown
}

export interface Drill {
  workDir: string
  databaseUrl: string
  /** a connection pool of the drill's own (it survives restarts: broken clients are dropped) */
  db: pg.Pool
  /** a TypeORM data source of the drill's own, for the test factories */
  dataSource: DataSource
  postgres: { stop(): void; start(): Promise<void>; terminateAppConnections(): Promise<number> }
  s3: { endpoint: string; stop(): Promise<void>; start(): Promise<void>; keys(prefix?: string): Promise<string[]> }
  smtp: { url: string; stop(): Promise<void>; start(): Promise<void>; received(): StoredMail[] }
  app: AppProcess
  close(): Promise<void>
}

export interface AppProcess {
  url: string
  /** every JSON log line the server printed, across restarts */
  logs: LogEntry[]
  /** the current child, or null while stopped */
  child: ChildProcess | null
  /** exits seen that the drill did not ask for (a crash) */
  unexpectedExits: { code: number | null; signal: string | null }[]
  start(): Promise<void>
  /** SIGTERM and wait for a clean exit */
  stop(): Promise<number | null>
  /** files the server left in its own temporary folder (the loader's compile cache aside) */
  tempFiles(): string[]
}

export async function startDrill(name: string, options: { env?: Record<string, string> } = {}): Promise<Drill> {
  const workDir = mkdtempSync(path.join(tmpdir(), `heardwell-drill-${name}-`))
  const cleanup: (() => unknown)[] = [() => rmSync(workDir, { recursive: true, force: true })]
  const close = async () => {
    for (const step of cleanup.reverse()) {
      try {
        await step()
      } catch {
        /* keep closing the rest */
      }
    }
  }
  try {
    const bin = ensurePostgresInstalled()
    const pgPort = await freePort()
    const dataDir = path.join(workDir, 'pg')
    const startPostgres = async () => {
      await ensureCluster({ bin, dataDir, port: pgPort, fast: true, log: () => {} })
    }
    await startPostgres()
    cleanup.push(() => stopCluster({ bin, dataDir }))
    const admin = new pg.Client({ host: '127.0.0.1', port: pgPort, user: 'postgres', database: 'postgres' })
    await admin.connect()
    await admin.query('CREATE DATABASE drill')
    await admin.end()
    const databaseUrl = `postgres://postgres@127.0.0.1:${pgPort}/drill`
    const drillUrl = `${databaseUrl}?application_name=${DRILL_APPLICATION_NAME}`

    const db = new pg.Pool({ connectionString: drillUrl, max: 3, connectionTimeoutMillis: 5000 })
    db.on('error', () => {}) // an idle client cut by a restart: the pool drops it
    cleanup.push(() => db.end())

    const s3Dir = path.join(workDir, 's3')
    let s3: FakeS3 | null = await startFakeS3(s3Dir, BUCKET)
    const s3Port = Number(new URL(s3.endpoint).port)
    cleanup.push(() => s3?.close())
    const s3Client = new S3Client({ endpoint: s3.endpoint, region: 'us-east-1', forcePathStyle: true, credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey } })
    cleanup.push(() => s3Client.destroy())

    const mailboxDir = path.join(workDir, 'mail')
    let smtp: FakeSmtp | null = await startFakeSmtp(mailboxDir)
    const smtpPort = smtp.port
    cleanup.push(() => smtp?.close())

    const appPort = await freePort()
    // The server gets a temporary folder of its own (TMPDIR), so a file it leaves behind is seen. The
    // TypeScript loader keeps its compile cache there too: link the usual one in, to start warm.
    const tempDir = path.join(workDir, 'app-tmp')
    mkdirSync(tempDir)
    const loaderCache = `tsx-${process.getuid?.() ?? 0}`
    if (existsSync(path.join(tmpdir(), loaderCache))) symlinkSync(path.join(tmpdir(), loaderCache), path.join(tempDir, loaderCache))
    const app = appProcess({
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(appPort),
      PUBLIC_URL: `http://127.0.0.1:${appPort}`,
      DATABASE_URL: databaseUrl,
      SESSION_SECRET: 'fault-drill-secret-that-is-long-enough',
      S3_ENDPOINT: s3.endpoint,
      S3_BUCKET: BUCKET,
      S3_ACCESS_KEY_ID: s3.accessKeyId,
      S3_SECRET_ACCESS_KEY: s3.secretAccessKey,
      S3_FORCE_PATH_STYLE: 'true',
      SMTP_URL: smtp.url,
      MIGRATE_ON_START: 'true',
      RUN_WORKER: 'true',
      LOG_LEVEL: 'info',
      LOGIN_FAILURES_PER_ADDRESS: '10000',
      CLIENT_DIST: path.join(workDir, 'no-client'),
      TMPDIR: tempDir,
      ...options.env,
    }, tempDir)
    cleanup.push(() => app.stop())
    await app.start()

    // after the app has migrated the schema
    const dataSource = await createDataSource(drillUrl, { poolSize: 2, logging: false, onPoolError: () => {} }).initialize()
    cleanup.push(() => dataSource.destroy())

    return {
      workDir,
      databaseUrl,
      db,
      dataSource,
      postgres: {
        stop: () => stopCluster({ bin, dataDir }),
        start: startPostgres,
        async terminateAppConnections() {
          const { rows } = await db.query(
            `SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = 'drill' AND pid <> pg_backend_pid() AND application_name <> $1`,
            [DRILL_APPLICATION_NAME],
          )
          return rows.length
        },
      },
      s3: {
        endpoint: s3.endpoint,
        async stop() {
          await s3?.close()
          s3 = null
        },
        async start() {
          s3 = await startFakeS3(s3Dir, BUCKET, s3Port)
        },
        async keys(prefix = '') {
          const keys: string[] = []
          let token: string | undefined
          do {
            const page = await s3Client.send(new ListObjectsV2Command({ Bucket: BUCKET, Prefix: prefix, ContinuationToken: token }))
            keys.push(...(page.Contents ?? []).map((o) => o.Key!))
            token = page.NextContinuationToken
          } while (token)
          return keys
        },
      },
      smtp: {
        url: smtp.url,
        async stop() {
          await smtp?.close()
          smtp = null
        },
        async start() {
          smtp = await startFakeSmtp(mailboxDir, smtpPort)
        },
        received: () => readMailbox(mailboxDir),
      },
      app,
      close,
    }
  } catch (error) {
    await close()
    throw error
  }
}

function appProcess(env: Record<string, string>, tempDir: string): AppProcess {
  const url = `http://127.0.0.1:${env.PORT}`
  const logs: LogEntry[] = []
  const unexpectedExits: AppProcess['unexpectedExits'] = []
  let stopping = false
  const self: AppProcess = {
    url,
    logs,
    child: null,
    unexpectedExits,
    async start() {
      if (self.child) throw new Error('the app is already running')
      stopping = false
      const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
        cwd: ROOT,
        env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '', TSX_TSCONFIG_PATH: 'tsconfig.server.json', AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true', ...env },
        stdio: ['ignore', 'pipe', 'pipe', 'ipc'],
      })
      self.child = child
      const output: string[] = []
      let buffered = ''
      child.stdout!.setEncoding('utf8').on('data', (chunk: string) => {
        buffered += chunk
        const lines = buffered.split('\n')
        buffered = lines.pop()!
        for (const line of lines) {
          try {
            logs.push(JSON.parse(line) as LogEntry)
          } catch {
            output.push(line)
          }
        }
      })
      child.stderr!.setEncoding('utf8').on('data', (chunk: string) => { output.push(chunk); if (process.env.FAULT_DRILL_STDERR) process.stderr.write(chunk) })
      child.on('exit', (code, signal) => {
        if (self.child === child) self.child = null
        if (!stopping) unexpectedExits.push({ code, signal })
      })
      await new Promise<void>((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error(`the app did not start within 60 s:\n${output.join('')}`)), 60_000)
        child.on('message', (message: { ready?: boolean }) => {
          if (!message?.ready) return
          clearTimeout(timer)
          resolve()
        })
        child.once('exit', (code) => {
          clearTimeout(timer)
          reject(new Error(`the app exited with ${code} while starting:\n${output.join('')}\n${JSON.stringify(logs.slice(-5))}`))
        })
      })
    },
    async stop() {
      const child = self.child
      if (!child) return null
      stopping = true
      const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)))
      child.kill('SIGTERM')
      const timer = setTimeout(() => child.kill('SIGKILL'), 15_000)
      const code = await exited
      clearTimeout(timer)
      return code
    },
    tempFiles: () => readdirSync(tempDir).filter((name) => !name.startsWith('tsx-')),
  }
  return self
}

/** A CSRF-aware supertest client signed in on the child process's address (supertest takes a URL as well as an app). */
export async function signedInClient(drill: Drill, email: string): Promise<Client> {
  const client = new Client(drill.app.url as unknown as TestContext['app'])
  const res = await client.signIn(email, TEST_PASSWORD)
  if (res.status !== 200) throw new Error(`sign-in: ${res.status}`)
  return client
}
