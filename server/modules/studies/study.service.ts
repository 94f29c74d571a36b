import type { DataSource, EntityManager } from 'typeorm'
import type { Study as StudyDto, StudyCreate, StudyListResponse, StudyUpdate } from '../../../shared/schemas/studies.js'
import type { StudyRole } from '../../../shared/permissions.js'
import { ConflictError, NotFoundError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { User } from '../users/user.entity.js'
import type { InvitationService } from './invitation.service.js'
import { Membership } from './membership.entity.js'
import { Study } from './study.entity.js'

interface StudyRow extends Study {
  leadName: string | null
  memberCount: number
}

export class StudyService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly invitations: InvitationService,
  ) {}

  private baseQuery(manager: EntityManager = this.dataSource.manager) {
    return manager
      .getRepository(Study)
      .createQueryBuilder('s')
      .addSelect(
        `(SELECT u.name FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.study_id = s.id AND m.role = 'lead' ORDER BY m.created_at LIMIT 1)`,
        'lead_name',
      )
      .addSelect(`(SELECT count(*)::int FROM memberships m WHERE m.study_id = s.id)`, 'member_count')
  }

  private async rows(qb: ReturnType<StudyService['baseQuery']>): Promise<StudyRow[]> {
    const { entities, raw } = await qb.getRawAndEntities()
    return entities.map((study) => {
      const r = raw.find((row) => row.s_id === study.id)
      return Object.assign(study, { leadName: r?.lead_name ?? null, memberCount: r?.member_count ?? 0 })
    })
  }

  toDto(row: StudyRow): StudyDto {
    return {
      id: row.id,
      code: row.code,
      title: row.title,
      summary: row.summary,
      ethicsBoard: row.ethicsBoard,
      ethicsReference: row.ethicsReference,
      approvalDate: row.approvalDate,
      approvalExpiry: row.approvalExpiry,
      targetSampleSize: row.targetSampleSize,
      leadName: row.leadName,
      memberCount: row.memberCount,
      createdAt: row.createdAt.toISOString(),
    }
  }

  /** The studies a person belongs to; the site administrator sees every study. */
  async list(user: Express.User): Promise<StudyListResponse> {
    const memberships = await this.dataSource.getRepository(Membership).findBy({ userId: user.id })
    const roles = new Map<string, StudyRole>(memberships.map((m) => [m.studyId, m.role]))
    const qb = this.baseQuery().orderBy('s.title', 'ASC')
    if (!user.siteAdmin) {
      if (!roles.size) return { studies: [] }
      qb.where('s.id IN (:...ids)', { ids: [...roles.keys()] })
    }
    const rows = await this.rows(qb)
    return { studies: rows.map((row) => ({ ...this.toDto(row), myRole: roles.get(row.id) ?? null })) }
  }

  /** One study in one plain statement with only the columns shown (the overview is read on every visit). */
  async get(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<StudyDto> {
    const [row]: {
      id: string
      code: string
      title: string
      summary: string
      ethics_board: string
      ethics_reference: string
      approval_date: string | null
      approval_expiry: string | null
      target_sample_size: number | null
      lead_name: string | null
      member_count: number
      created_at: Date
    }[] = await manager.query(
      `SELECT s.id, s.code, s.title, s.summary, s.ethics_board, s.ethics_reference, s.approval_date::text AS approval_date, s.approval_expiry::text AS approval_expiry,
              s.target_sample_size, s.created_at,
              (SELECT u.name FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.study_id = s.id AND m.role = 'lead' ORDER BY m.created_at LIMIT 1) AS lead_name,
              (SELECT count(*)::int FROM memberships m WHERE m.study_id = s.id) AS member_count
         FROM studies s WHERE s.id = $1`,
      [studyId],
    )
    if (!row) throw new NotFoundError('study')
    return {
      id: row.id,
      code: row.code,
      title: row.title,
      summary: row.summary,
      ethicsBoard: row.ethics_board,
      ethicsReference: row.ethics_reference,
      approvalDate: row.approval_date,
      approvalExpiry: row.approval_expiry,
      targetSampleSize: row.target_sample_size,
      leadName: row.lead_name,
      memberCount: row.member_count,
      createdAt: new Date(row.created_at).toISOString(),
    }
  }

  async create(input: StudyCreate, actor: AuditActor): Promise<StudyDto> {
    return this.dataSource.transaction(async (manager) => {
      if (await manager.existsBy(Study, { code: input.code })) {
        throw new ConflictError(`A study with the short code ${input.code} already exists. Choose another code.`)
      }
      const study = await manager.save(manager.create(Study, { code: input.code, title: input.title, summary: input.summary }))
      await this.audit.record(actor, { action: 'study.created', studyId: study.id, targetType: 'study', targetId: study.id, details: { code: study.code } }, manager)
      await this.setLead(manager, study.id, input.leadEmail, actor)
      return this.get(study.id, manager)
    })
  }

  async update(studyId: string, input: StudyUpdate, actor: AuditActor): Promise<StudyDto> {
    return this.dataSource.transaction(async (manager) => {
      const study = await manager.findOneBy(Study, { id: studyId })
      if (!study) throw new NotFoundError('study')
      const changes: Record<string, { from: unknown; to: unknown }> = {}
      for (const [key, value] of Object.entries(input) as [keyof StudyUpdate, unknown][]) {
        if (value !== undefined && study[key] !== value) changes[key] = { from: study[key], to: value }
      }
      const expiry = input.approvalExpiry !== undefined ? input.approvalExpiry : study.approvalExpiry
      const approval = input.approvalDate !== undefined ? input.approvalDate : study.approvalDate
      if (approval && expiry && approval > expiry) {
        throw new ConflictError('The approval expiry must come after the approval date.')
      }
      if (Object.keys(changes).length) {
        await manager.update(Study, { id: studyId }, input)
        await this.audit.record(actor, { action: 'study.updated', studyId, targetType: 'study', targetId: studyId, details: { changes } }, manager)
      }
      return this.get(studyId, manager)
    })
  }

  async assignLead(studyId: string, email: string, actor: AuditActor): Promise<StudyDto> {
    return this.dataSource.transaction(async (manager) => {
      if (!(await manager.existsBy(Study, { id: studyId }))) throw new NotFoundError('study')
      await this.setLead(manager, studyId, email, actor)
      return this.get(studyId, manager)
    })
  }

  /** Makes an existing account the lead, or invites the e-mail address as lead. */
  private async setLead(manager: EntityManager, studyId: string, email: string, actor: AuditActor): Promise<void> {
    const user = await manager.findOneBy(User, { email })
    if (!user) {
      await this.invitations.createIn(manager, studyId, { email, role: 'lead' }, actor)
      return
    }
    const existing = await manager.findOneBy(Membership, { studyId, userId: user.id })
    if (existing?.role === 'lead') return
    if (existing) await manager.update(Membership, { id: existing.id }, { role: 'lead' })
    else await manager.insert(Membership, { studyId, userId: user.id, role: 'lead' })
    await this.audit.record(
      actor,
      { action: 'study.lead_assigned', studyId, targetType: 'user', targetId: user.id, details: { email, previousRole: existing?.role ?? null } },
      manager,
    )
  }
}
