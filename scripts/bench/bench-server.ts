/**
 * The app and its baseline in a process of their own, so a load generator in the parent does not share
 * the server's event loop (as real clients would not). Prints one JSON line with the ports and the
 * database URL, then serves until SIGTERM or until its parent's stdin closes.
 */
import { startBenchEnvironment } from './bench-environment.js'

const env = await startBenchEnvironment()
process.stdout.write(`${JSON.stringify({ appPort: env.appPort, basePort: env.basePort, studyId: env.studyId, databaseUrl: env.databaseUrl })}\n`)
let closing = false
const stop = async () => {
  if (closing) return
  closing = true
  await env.close()
  process.exit(0)
}
process.on('SIGTERM', stop)
process.stdin.on('end', stop)
process.stdin.resume()
