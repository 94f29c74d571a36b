import type PgBoss from 'pg-boss'
import { ROUND_REMINDER_QUEUE, type ReviewRoundService } from './review-round.service.js'

/** Sends the reminders pg-boss releases two days before a review round closes. */
export async function startRoundReminderWorker(boss: PgBoss, rounds: ReviewRoundService): Promise<string> {
  return boss.work<{ roundId: string }>(ROUND_REMINDER_QUEUE, { batchSize: 1, pollingIntervalSeconds: 30 }, async ([job]) => {
    await rounds.remind(job.data.roundId)
  })
}
