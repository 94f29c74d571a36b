import 'reflect-metadata'
import { DataSource } from 'typeorm'
import { entities } from './entities.js'
import { migrations } from './migrations/index.js'

/** Builds the TypeORM data source. The schema changes only through migrations (never synchronize). */
export function createDataSource(url: string, options: { poolSize?: number; logging?: boolean; onPoolError?: (error: Error) => void } = {}): DataSource {
  return new DataSource({
    type: 'postgres',
    url,
    entities,
    migrations,
    synchronize: false,
    migrationsRun: false,
    uuidExtension: 'pgcrypto',
    logging: options.logging === false ? false : ['error'],
    poolSize: options.poolSize ?? 10,
    extra: { connectionTimeoutMillis: 5000 },
    // An idle client hit by a database restart reports here instead of killing the process (node-postgres #1707).
    poolErrorHandler: options.onPoolError ?? (() => {}),
  })
}

/** Used by the TypeORM command line (`npm run db:migrate`, `db:migration:generate`). */
export default createDataSource(process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54329/heardwell')
