// Installs npm dependencies when node_modules is missing or older than the lock file.
import { spawnSync } from 'node:child_process'
import { existsSync, statSync } from 'node:fs'

export function ensureDependencies(log = console.log) {
  const marker = 'node_modules/.package-lock.json'
  const stale = !existsSync(marker) || statSync('package-lock.json').mtimeMs > statSync(marker).mtimeMs
  if (!stale) return
  log('Installing dependencies (npm ci)…')
  const result = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { stdio: 'inherit' })
  if (result.status !== 0) throw new Error('npm ci failed; see the messages above.')
}
