import { Router } from 'express'
import type { DataSource } from 'typeorm'
import type { HealthResponse } from '../../../shared/schemas/health.js'
import type { Authorize } from '../../middleware/authorize.js'
import type { ObjectStore } from '../../storage/object-store.js'

export interface HealthDeps {
  authorize: Authorize
  dataSource: DataSource
  storage: ObjectStore
  /** resolves when the SMTP server answers; rejects otherwise */
  checkMail: () => Promise<unknown>
}

function within<T>(promise: Promise<T>, ms: number): Promise<T> {
  return Promise.race([promise, new Promise<T>((_, reject) => setTimeout(() => reject(new Error('timeout')), ms).unref())])
}

/** `{ status, db, storage, mail }`; 503 when the database or object store is down (mail only delays). */
export function healthRouter({ authorize, dataSource, storage, checkMail }: HealthDeps) {
  const router = Router()
  router.get('/health', authorize('public'), async (_req, res) => {
    const [db, store, mail] = await Promise.all([
      within(dataSource.query('SELECT 1'), 3000).then(() => 'ok', () => 'unreachable'),
      within(storage.ping(), 3000).then(() => 'ok', () => 'unreachable'),
      within(checkMail(), 3000).then(() => 'ok', () => 'unreachable'),
    ])
    const body: HealthResponse = { status: db === 'ok' && store === 'ok' && mail === 'ok' ? 'ok' : 'degraded', db, storage: store, mail }
    res.status(db === 'ok' && store === 'ok' ? 200 : 503).json(body)
  })
  return router
}
