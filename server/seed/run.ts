import { createDataSource } from '../db/data-source.js'
import { seedDemo } from './demo.js'

/** `npm run db:seed`: loads the demo study into DATABASE_URL (refused when NODE_ENV=production). */
const url = process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54329/heardwell'
const dataSource = await createDataSource(url).initialize()
try {
  await seedDemo(dataSource, process.env.NODE_ENV ?? 'development')
  console.log('The demo study is loaded.')
} finally {
  await dataSource.destroy()
}
