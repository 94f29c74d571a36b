#!/usr/bin/env node
// `npm test`: installs what a fresh machine lacks (dependencies, Debian's PostgreSQL and Chromium),
// type-checks, lints, then runs every vitest project. The tests start their own throw-away
// PostgreSQL cluster, fake S3 and fake SMTP (tests/support/global-setup.ts) and never touch the
// data of `npm start`. The output ends with vitest's summary line.
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import path from 'node:path'
import { ensureDependencies } from './lib/deps.mjs'

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '..')
process.chdir(root)
const log = (message) => console.log(`[heardwell test] ${message}`)
const isRoot = process.getuid?.() === 0
const bin = (name) => path.join('node_modules', '.bin', name)

ensureDependencies(log)
const { ensurePostgresInstalled } = await import('./lib/postgres.mjs')
ensurePostgresInstalled(log)
ensureChromium()

const env = { ...process.env, AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true' }
step('Type-checking', bin('vue-tsc'), ['-b'])
step('Linting', bin('eslint'), ['.', '--max-warnings', '0'])
step('Building the client for the browser tests', bin('vite'), ['build', '--logLevel', 'warn', '--outDir', 'test-output/client', '--emptyOutDir'])
const extra = process.argv.slice(2)
const result = spawnSync(bin('vitest'), ['run', ...extra], { stdio: 'inherit', env: { ...env, TEST_CLIENT_DIST: 'test-output/client' } })
process.exit(result.status ?? 1)

function step(title, command, args) {
  log(`${title}…`)
  const started = Date.now()
  const r = spawnSync(command, args, { stdio: 'inherit', env })
  if (r.status !== 0) {
    console.error(`[heardwell test] ${title} failed.`)
    process.exit(r.status ?? 1)
  }
  log(`${title}: done in ${((Date.now() - started) / 1000).toFixed(1)} s`)
}

function ensureChromium() {
  if (existsSync('/usr/bin/chromium')) return
  if (!isRoot) {
    console.error('[heardwell test] Browser tests need Chromium: sudo apt-get install -y chromium')
    process.exit(1)
  }
  log('Installing Chromium from Debian packages for the browser tests (one time)…')
  for (const args of [['update', '-qq'], ['install', '-y', '-qq', 'chromium']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } })
    if (r.status !== 0) process.exit(r.status ?? 1)
  }
}
