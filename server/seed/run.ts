import { loadConfig } from '../config.js'
import { createDataSource } from '../db/data-source.js'
import { createLogger } from '../lib/logger.js'
import { seedDemo } from './demo.js'

/** `npm run db:seed`: loads the demo study into DATABASE_URL. */
const config = loadConfig()
const dataSource = await createDataSource(config.DATABASE_URL).initialize()
try {
  await seedDemo(dataSource, config.NODE_ENV, createLogger(config.LOG_LEVEL))
} finally {
  await dataSource.destroy()
}
