import type { DataSource } from 'typeorm'
import type PgBoss from 'pg-boss'
import type { ObjectStore } from '../../storage/object-store.js'
import type { AuditService } from '../audit/audit.service.js'
import { Transcript } from './transcript.entity.js'

export const PURGE_QUEUE = 'purge-withdrawn-data'

/**
 * Deletes the transcript files of participants who withdrew their data, once the study's grace
 * period has passed (the grace lets a mistaken withdrawal be corrected). The rows stay, marked
 * purged, so the audit trail and counts still make sense; the text is gone from the store and
 * from the searchable copies (turn texts, excerpt passages).
 */
export async function purgeWithdrawnData(dataSource: DataSource, storage: ObjectStore, audit: AuditService, now = new Date()): Promise<number> {
  const due: { id: string; study_id: string; object_key: string }[] = await dataSource.query(
    `SELECT t.id, t.study_id, t.object_key
       FROM transcripts t
       JOIN withdrawals w ON w.participant_id = t.participant_id AND w.data_removed
       JOIN studies s ON s.id = t.study_id
      WHERE t.object_key IS NOT NULL AND t.purged_at IS NULL
        AND w.created_at + make_interval(days => s.data_removal_grace_days) <= $1`,
    [now],
  )
  for (const row of due) {
    await storage.delete(row.object_key)
    await dataSource.transaction(async (manager) => {
      await manager.update(Transcript, { id: row.id }, { purgedAt: now, objectKey: null })
      // the searchable copies of the text go too: turn texts and the excerpts' quoted passages
      await manager.query(`UPDATE transcript_turns SET text = NULL WHERE transcript_id = $1`, [row.id])
      await manager.query(`UPDATE excerpts SET text = '' WHERE transcript_id = $1`, [row.id])
      await audit.record({ id: null, email: null, ip: null }, { action: 'transcript.purged', studyId: row.study_id, targetType: 'transcript', targetId: row.id, details: { reason: 'participant withdrew their data; grace period over' } }, manager)
    })
  }
  return due.length
}

/** Runs the purge once a day through pg-boss's scheduler (one instance runs each slot). */
export async function startPurgeSchedule(boss: PgBoss, run: () => Promise<number>): Promise<void> {
  await boss.schedule(PURGE_QUEUE, '17 3 * * *', {})
  await boss.work(PURGE_QUEUE, async () => {
    await run()
  })
}
