// Finds, installs, initialises, starts and stops Debian's PostgreSQL for `npm start` and `npm test`.
// Plain JavaScript: it runs before dependencies are installed.
import { execFileSync, spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, readdirSync, chmodSync } from 'node:fs'
import path from 'node:path'
import net from 'node:net'

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0

/** The folder holding initdb and pg_ctl, or null. */
export function findPostgresBin() {
  const root = '/usr/lib/postgresql'
  if (!existsSync(root)) return null
  const versions = readdirSync(root)
    .filter((v) => existsSync(path.join(root, v, 'bin', 'initdb')) && existsSync(path.join(root, v, 'bin', 'postgres')))
    .sort((a, b) => Number(b) - Number(a))
  return versions.length ? path.join(root, versions[0], 'bin') : null
}

/** Installs Debian's postgresql when its server binaries are missing (root only). */
export function ensurePostgresInstalled(log = console.log) {
  let bin = findPostgresBin()
  if (bin) return bin
  if (!isRoot) {
    throw new Error(
      'PostgreSQL server binaries were not found. Install them with `sudo apt-get install -y postgresql` ' +
        '(Debian/Ubuntu), or set DATABASE_URL to a PostgreSQL server you already run.',
    )
  }
  log('Installing PostgreSQL from Debian packages (one time)…')
  run('apt-get', ['update', '-qq'])
  run('apt-get', ['install', '-y', '-qq', 'postgresql'], { DEBIAN_FRONTEND: 'noninteractive' })
  bin = findPostgresBin()
  if (!bin) throw new Error('apt-get finished but no PostgreSQL server binaries were found under /usr/lib/postgresql.')
  return bin
}

function run(cmd, args, env = {}) {
  const result = spawnSync(cmd, args, { stdio: 'inherit', env: { ...process.env, ...env } })
  if (result.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed with exit code ${result.status}`)
}

/** Runs a PostgreSQL tool, as the `postgres` OS user when we are root (initdb and pg_ctl refuse root). */
function pgTool(bin, tool, args, { quiet = false } = {}) {
  const exe = path.join(bin, tool)
  const [cmd, full] = isRoot ? ['runuser', ['-u', 'postgres', '--', exe, ...args]] : [exe, args]
  return spawnSync(cmd, full, { cwd: '/', encoding: 'utf8', stdio: quiet ? 'pipe' : ['ignore', 'pipe', 'pipe'] })
}

/**
 * Makes sure a cluster exists in `dataDir` and runs on 127.0.0.1:`port`.
 * Returns { started } — true when this call started it (so the caller should stop it on exit).
 */
export async function ensureCluster({ bin, dataDir, port, fast = false, log = console.log }) {
  dataDir = path.resolve(dataDir)
  if (!existsSync(path.join(dataDir, 'PG_VERSION'))) {
    mkdirSync(dataDir, { recursive: true })
    if (isRoot) {
      execFileSync('chown', ['-R', 'postgres:postgres', dataDir])
      makeTraversable(dataDir)
    }
    chmodSync(dataDir, 0o700)
    log(`Creating a PostgreSQL cluster in ${dataDir}…`)
    const init = pgTool(bin, 'initdb', ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'])
    if (init.status !== 0) throw new Error(`initdb failed:\n${init.stderr || init.stdout}`)
  }
  if (await isPortOpen(port)) {
    const status = pgTool(bin, 'pg_ctl', ['-D', dataDir, 'status'], { quiet: true })
    if (status.status === 0) return { started: false }
    throw new Error(`Port ${port} on 127.0.0.1 is taken by another program. Stop it, or set DATABASE_URL.`)
  }
  const options = [`-c listen_addresses=127.0.0.1`, `-p ${port}`, `-k ${dataDir}`]
  if (fast) options.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off')
  const start = pgTool(bin, 'pg_ctl', ['-D', dataDir, '-l', path.join(dataDir, 'server.log'), '-w', '-t', '60', '-o', options.join(' '), 'start'])
  if (start.status !== 0) throw new Error(`PostgreSQL did not start:\n${start.stderr || start.stdout}\nSee ${dataDir}/server.log`)
  return { started: true }
}

export function stopCluster({ bin, dataDir }) {
  pgTool(bin, 'pg_ctl', ['-D', path.resolve(dataDir), '-m', 'fast', '-w', '-t', '30', 'stop'], { quiet: true })
}

/** As root, the postgres user must be able to walk into the data folder's parents. */
function makeTraversable(dir) {
  let current = path.dirname(dir)
  while (current !== path.dirname(current)) {
    try {
      execFileSync('chmod', ['o+x', current])
    } catch {
      /* a parent we cannot change: initdb will say so */
    }
    current = path.dirname(current)
  }
}

export function isPortOpen(port, host = '127.0.0.1') {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host })
    socket.once('connect', () => {
      socket.destroy()
      resolve(true)
    })
    socket.once('error', () => resolve(false))
  })
}

/** A free TCP port on 127.0.0.1. */
export function freePort() {
  return new Promise((resolve, reject) => {
    const server = net.createServer()
    server.once('error', reject)
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address()
      server.close(() => resolve(port))
    })
  })
}

