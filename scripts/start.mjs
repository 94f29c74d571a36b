#!/usr/bin/env node
// `npm start`: set up everything on a fresh machine and run Heardwell on http://127.0.0.1:3000.
// `npm run dev`: the same services, with Vite's hot reload on :5173 and /api proxied to Express.
// Every service can be pointed elsewhere with DATABASE_URL, S3_ENDPOINT, SMTP_URL (see .env.example);
// the matching local service is then not started.
import { spawn, spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import path from 'node:path'
import { ensureDependencies } from './lib/deps.mjs'

const dev = process.argv.includes('--dev')
const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '..')
process.chdir(root)
const started = Date.now()
const log = (message) => console.log(`[heardwell] ${message}`)

loadDotEnv()
ensureDependencies(log)
const { ensurePostgresInstalled, ensureCluster, stopCluster } = await import('./lib/postgres.mjs')

const env = { ...process.env, NODE_ENV: process.env.NODE_ENV ?? 'development', AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true' }
env.PORT ??= '3000'
env.PUBLIC_URL ??= dev ? 'http://127.0.0.1:5173' : `http://127.0.0.1:${env.PORT}`
env.SESSION_SECRET ??= localSecret()
env.MIGRATE_ON_START ??= 'true'
if (env.NODE_ENV !== 'production') env.SEED_DEMO ??= 'true'

let cluster = null
if (!env.DATABASE_URL) {
  const port = Number(env.PG_PORT ?? 54329)
  const bin = ensurePostgresInstalled(log)
  const dataDir = '.data/postgres'
  const { started: startedNow } = await ensureCluster({ bin, dataDir, port, log })
  if (startedNow) cluster = { bin, dataDir }
  log(`PostgreSQL ${startedNow ? 'started' : 'already running'} on 127.0.0.1:${port} (${dataDir})`)
  createDatabase(bin, port, 'heardwell')
  env.DATABASE_URL = `postgres://postgres@127.0.0.1:${port}/heardwell`
}

if (!dev) {
  log('Building the client…')
  const build = spawnSync(path.join('node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn'], { stdio: 'inherit', env })
  if (build.status !== 0) finish(1, 'The client build failed; see above.')
}

const children = []
const server = spawn(path.join('node_modules', '.bin', 'tsx'), ['--tsconfig', 'tsconfig.server.json', 'server/index.ts'], {
  stdio: ['ignore', 'pipe', 'inherit', 'ipc'],
  env,
})
children.push(server)
server.stdout.on('data', (chunk) => {
  for (const line of String(chunk).split('\n').filter(Boolean)) {
    try {
      const entry = JSON.parse(line)
      if (entry.level >= 30) console.log(`  ${entry.msg}${entry.err ? `: ${typeof entry.err === 'string' ? entry.err : entry.err.message}` : ''}`)
    } catch {
      console.log(line)
    }
  }
})
server.on('message', (message) => {
  if (!message?.ready) return
  const url = dev ? 'http://127.0.0.1:5173' : message.url
  if (dev) children.push(spawn(path.join('node_modules', '.bin', 'vite'), [], { stdio: 'inherit', env }))
  const seconds = ((Date.now() - started) / 1000).toFixed(1)
  console.log(`
  Heardwell is running at ${url}   (ready in ${seconds} s; Ctrl-C stops everything)

  Demo sign-ins (demo only — never use these anywhere real), password: listen-with-care-2026
    admin@heardwell.test        site administrator
    lead@heardwell.test         lead researcher
    coordinator@heardwell.test  coordinator
    coder1@heardwell.test       coder
    coder2@heardwell.test       coder
    partner@heardwell.test      patient partner
  E-mail sent by the app locally: ${url}/dev/mailbox
`)
})
server.on('exit', (code) => finish(code ?? 0))

let finishing = false
function finish(code, message) {
  if (finishing) return
  finishing = true
  if (message) console.error(message)
  for (const child of children) if (child.exitCode === null) child.kill('SIGTERM')
  const done = () => {
    if (cluster) {
      log('Stopping PostgreSQL…')
      stopCluster(cluster)
    }
    process.exit(code)
  }
  if (children.some((c) => c.exitCode === null)) setTimeout(done, 1500)
  else done()
}
process.on('SIGINT', () => finish(0))
process.on('SIGTERM', () => finish(0))

function createDatabase(bin, port, name) {
  const psql = path.join(bin, 'psql')
  const args = ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', '-tAc']
  const exists = spawnSync(psql, [...args, `SELECT 1 FROM pg_database WHERE datname = '${name}'`], { encoding: 'utf8' })
  if (exists.stdout.trim() !== '1') {
    const created = spawnSync(psql, [...args, `CREATE DATABASE ${name}`], { encoding: 'utf8' })
    if (created.status !== 0) finish(1, `Could not create the database: ${created.stderr}`)
  }
}

/** A random session secret kept in .data so sessions survive restarts on this machine. */
function localSecret() {
  const file = '.data/session-secret'
  if (!existsSync(file)) {
    mkdirSync('.data', { recursive: true })
    writeFileSync(file, randomBytes(48).toString('base64url'), { mode: 0o600 })
  }
  return readFileSync(file, 'utf8').trim()
}

/** Reads KEY=value lines from .env when present (values already in the environment win). */
function loadDotEnv() {
  if (!existsSync('.env')) return
  for (const line of readFileSync('.env', 'utf8').split('\n')) {
    const match = line.match(/^\s*([A-Z0-9_]+)\s*=\s*(.*)\s*$/)
    if (match && process.env[match[1]] === undefined) process.env[match[1]] = match[2].replace(/^['"]|['"]$/g, '')
  }
}
