import { loadConfig } from './config.js'
import { createLogger } from './lib/logger.js'
import { startRuntime } from './runtime.js'

/** Reads the configuration, starts the services and listens. Ctrl-C or SIGTERM stops cleanly. */
const config = loadConfig()
const log = createLogger(config.LOG_LEVEL)

process.on('unhandledRejection', (reason) => log.error({ err: reason }, 'unhandled promise rejection'))

startRuntime(config, log)
  .then((runtime) => {
    log.info({ url: runtime.url }, 'Heardwell is listening')
    if (process.send) process.send({ ready: true, url: runtime.url })
    let stopping = false
    const stop = (signal: string) => {
      if (stopping) return
      stopping = true
      log.info({ signal }, 'stopping')
      runtime.stop().then(
        () => process.exit(0),
        () => process.exit(1),
      )
    }
    process.on('SIGINT', () => stop('SIGINT'))
    process.on('SIGTERM', () => stop('SIGTERM'))
  })
  .catch((error: Error) => {
    log.fatal({ err: error }, `Heardwell could not start: ${error.message}`)
    process.exit(1)
  })
