import type PgBoss from 'pg-boss'
import { REMINDER_QUEUE, type InterviewService } from './interview.service.js'

/** Sends the 24-hour interview reminders that pg-boss releases at their time. */
export async function startReminderWorker(boss: PgBoss, interviews: InterviewService): Promise<string> {
  return boss.work<{ interviewId: string; sequence: number }>(REMINDER_QUEUE, { batchSize: 1, pollingIntervalSeconds: 5 }, async ([job]) => {
    await interviews.sendReminder(job.data.interviewId, job.data.sequence)
  })
}
