import type { DataSource, EntityManager } from 'typeorm'
import type { Request } from 'express'
import type { AuditPage, AuditQuery } from '../../../shared/schemas/audit.js'
import { AuditEvent } from './audit-event.entity.js'

export interface AuditActor {
  id: string | null
  email: string | null
  ip: string | null
}

export interface AuditEntry {
  action: string
  studyId?: string | null
  targetType?: string | null
  targetId?: string | null
  details?: Record<string, unknown>
}

/** Who is acting in this request, for the audit trail. */
export function actorOf(req: Request, fallbackEmail: string | null = null): AuditActor {
  return { id: req.user?.id ?? null, email: req.user?.email ?? fallbackEmail, ip: req.ip ?? null }
}

/** Appends to the audit trail; pass the transaction's manager so the line commits with the change. */
export class AuditService {
  constructor(private readonly dataSource: DataSource) {}

  async record(actor: AuditActor, entry: AuditEntry, manager: EntityManager = this.dataSource.manager): Promise<void> {
    const event = manager.create(AuditEvent, {
      actorId: actor.id,
      actorEmail: actor.email?.slice(0, 254) ?? null,
      ip: actor.ip?.slice(0, 64) ?? null,
      action: entry.action,
      studyId: entry.studyId ?? null,
      targetType: entry.targetType ?? null,
      targetId: entry.targetId ?? null,
      details: entry.details ?? {},
    })
    await manager.getRepository(AuditEvent).save(event, { reload: false })
  }

  /** One page of a study's trail, or with `null` the site-wide one. */
  async page(studyId: string | null, query: AuditQuery): Promise<AuditPage> {
    const qb = this.dataSource.getRepository(AuditEvent).createQueryBuilder('e')
    if (studyId) qb.where('e.study_id = :studyId', { studyId })
    // the site trail: sign-ins and accounts, plus the administrator's own study actions
    else qb.where(`(e.study_id IS NULL OR e.action IN ('study.created', 'study.lead_assigned'))`)
    qb
      .orderBy('e.at', 'DESC')
      .addOrderBy('e.id', 'DESC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
    if (query.action) qb.andWhere('e.action ILIKE :action', { action: `%${escapeLike(query.action)}%` })
    if (query.actor) qb.andWhere('e.actor_email ILIKE :actor', { actor: `%${escapeLike(query.actor)}%` })
    const [events, total] = await qb.getManyAndCount()
    return {
      total,
      page: query.page,
      pageSize: query.pageSize,
      events: events.map((e) => ({
        id: String(e.id),
        at: e.at.toISOString(),
        actorEmail: e.actorEmail,
        action: e.action,
        targetType: e.targetType,
        targetId: e.targetId,
        ip: e.ip,
        details: e.details,
      })),
    }
  }
}

function escapeLike(value: string): string {
  return value.replace(/[\\%_]/g, (c) => `\\${c}`)
}
