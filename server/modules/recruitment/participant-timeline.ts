import type { EntityManager } from 'typeorm'
import type { AuditActor } from '../audit/audit.service.js'
import { User } from '../users/user.entity.js'
import { ParticipantEvent, type ParticipantEventKind } from './participant-event.entity.js'
import { Participant } from './participant.entity.js'

/**
 * Adds a line to a participant's timeline (inside the caller's transaction) and marks the
 * participant as active now. Every module that changes a participant's story writes through here.
 */
export async function addTimelineEvent(
  manager: EntityManager,
  participant: Pick<Participant, 'id' | 'studyId'>,
  kind: ParticipantEventKind,
  summary: string,
  actor: Pick<AuditActor, 'id'> | null,
  details: Record<string, unknown> = {},
): Promise<void> {
  const actorName = actor?.id ? ((await manager.findOneBy(User, { id: actor.id }))?.name ?? null) : null
  await manager.insert(ParticipantEvent, {
    studyId: participant.studyId,
    participantId: participant.id,
    kind,
    summary: summary.slice(0, 300),
    actorId: actor?.id ?? null,
    actorName,
    details: details as never,
  })
  await manager.update(Participant, { id: participant.id }, { lastActivityAt: () => 'now()' })
}
