import type { EntityManager, EntityTarget, ObjectLiteral } from 'typeorm'
import { ConflictError, NotFoundError } from '../../lib/errors.js'

/**
 * Optimistic locking done properly: TypeORM's version column alone does not check the version on
 * save, so every change is `UPDATE … SET …, version = version + 1 WHERE id = $1 AND study_id = $2 AND
 * version = $3` and zero affected rows means someone else changed (or removed) the row first.
 */
export async function updateWithVersion<T extends ObjectLiteral>(
  manager: EntityManager,
  entity: EntityTarget<T>,
  key: { id: string; studyId: string },
  version: number,
  changes: Record<string, unknown>,
  what: string,
): Promise<void> {
  const result = await manager
    .createQueryBuilder()
    .update(entity)
    .set({ ...changes, version: () => 'version + 1' } as never)
    .where('id = :id AND study_id = :studyId AND version = :version', { ...key, version })
    .execute()
  if (result.affected) return
  const current = await manager.getRepository(entity).findOne({ where: { id: key.id, studyId: key.studyId } as never, select: { version: true } as never })
  if (!current) throw new NotFoundError(what)
  throw staleError(what, version, (current as unknown as { version: number }).version)
}

export function staleError(what: string, sent: number, current: number): ConflictError {
  return new ConflictError(
    `Someone else changed this ${what} after you opened it (you had version ${sent}, it is now version ${current}). Your change was not saved: look at the latest version and make your change again.`,
  )
}
