import { In, IsNull, type DataSource, type EntityManager } from 'typeorm'
import { readability } from '../../../shared/readability/index.js'
import type { Theme as ThemeDto, ThemeCreate, ThemeOrder, ThemeUpdate } from '../../../shared/schemas/themes.js'
import { ConflictError, NotFoundError, UnprocessableError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { ConsentService } from '../consent/consent.service.js'
import type { CodingScope } from '../coding/coding-scope.js'
import { updateWithVersion } from '../coding/versioned-update.js'
import { Theme, ThemeCode, ThemeExcerpt } from './theme.entity.js'

/**
 * Themes for the team: built from codes, with supporting excerpts the lead chooses and marks as
 * shareable with partners. Whether a partner may ever see an excerpt is decided by the consent policy
 * (mayShowPartners), shown here so the lead knows before sharing.
 */
export class ThemeService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly scope: CodingScope,
    private readonly consent: ConsentService,
  ) {}

  async list(studyId: string): Promise<ThemeDto[]> {
    const themes = await this.dataSource.getRepository(Theme).find({ where: { studyId }, order: { position: 'ASC', createdAt: 'ASC' } })
    if (!themes.length) return []
    const ids = themes.map((t) => t.id)
    const usable = await this.scope.usableParticipants(studyId)
    const [codes, chosen, support, open] = await Promise.all([
      this.dataSource.getRepository(ThemeCode).find({ where: { themeId: In(ids) } }),
      this.dataSource.query(
        `SELECT te.theme_id, te.excerpt_id, te.share_with_partners, e.text, e.transcript_id, e.start_offset, e.participant_id, p.pseudonym
           FROM theme_excerpts te JOIN excerpts e ON e.id = te.excerpt_id JOIN participants p ON p.id = e.participant_id
          WHERE te.theme_id = ANY($1::uuid[]) AND e.participant_id = ANY($2::uuid[]) ORDER BY te.position`,
        [ids, usable],
      ) as Promise<{ theme_id: string; excerpt_id: string; share_with_partners: boolean; text: string; transcript_id: string; start_offset: number; participant_id: string; pseudonym: string }[]>,
      this.dataSource.query(
        `SELECT tc.theme_id, count(DISTINCT e.id)::int AS excerpts, count(DISTINCT e.participant_id)::int AS participants
           FROM theme_codes tc JOIN excerpt_codes x ON x.code_id = tc.code_id JOIN excerpts e ON e.id = x.excerpt_id
          WHERE tc.theme_id = ANY($1::uuid[]) AND e.participant_id = ANY($2::uuid[]) GROUP BY tc.theme_id`,
        [ids, usable],
      ) as Promise<{ theme_id: string; excerpts: number; participants: number }[]>,
      this.dataSource.query(
        `SELECT DISTINCT rt.theme_id FROM review_round_themes rt JOIN review_rounds r ON r.id = rt.round_id WHERE r.study_id = $1 AND r.status = 'open'`,
        [studyId],
      ) as Promise<{ theme_id: string }[]>,
    ])
    const uses = await this.consent.dataUseFor(studyId, chosen.map((c) => c.participant_id))
    const supportOf = new Map(support.map((s) => [s.theme_id, { participants: s.participants, excerpts: s.excerpts }]))
    const inOpen = new Set(open.map((o) => o.theme_id))
    return themes.map((t) => ({
      id: t.id,
      parentId: t.parentId,
      position: t.position,
      name: t.name,
      description: t.description,
      plainDescription: t.plainDescription,
      plainGrade: gradeOf(t.plainDescription),
      status: t.status,
      codeIds: codes.filter((c) => c.themeId === t.id).map((c) => c.codeId),
      excerpts: chosen
        .filter((c) => c.theme_id === t.id)
        .map((c) => ({ excerptId: c.excerpt_id, shareWithPartners: c.share_with_partners, text: c.text, pseudonym: c.pseudonym, transcriptId: c.transcript_id, start: c.start_offset, mayShowPartners: uses.get(c.participant_id)?.mayShowPartners ?? false })),
      support: supportOf.get(t.id) ?? { participants: 0, excerpts: 0 },
      inOpenRound: inOpen.has(t.id),
      version: t.version,
      updatedAt: t.updatedAt.toISOString(),
    }))
  }

  async one(studyId: string, themeId: string): Promise<ThemeDto> {
    const theme = (await this.list(studyId)).find((t) => t.id === themeId)
    if (!theme) throw new NotFoundError('theme')
    return theme
  }

  async create(studyId: string, input: ThemeCreate, actor: AuditActor): Promise<ThemeDto> {
    const id = await this.dataSource.transaction(async (manager) => {
      const parentId = input.parentId ?? null
      if (parentId && !(await manager.existsBy(Theme, { id: parentId, studyId }))) throw new UnprocessableError('The parent theme is not in this study.', [{ path: 'parentId', message: 'Choose a theme of this study.' }])
      const position = await manager.count(Theme, { where: { studyId, parentId: parentId ?? IsNull() } })
      const saved = await manager.save(manager.create(Theme, { studyId, parentId, position, name: input.name, description: input.description ?? '', plainDescription: input.plainDescription ?? '' }))
      await this.setLinks(manager, studyId, saved.id, input.codeIds, input.excerpts)
      await this.audit.record(actor, { action: 'theme.created', studyId, targetType: 'theme', targetId: saved.id, details: { name: saved.name } }, manager)
      return saved.id
    })
    return this.one(studyId, id)
  }

  async update(studyId: string, themeId: string, input: ThemeUpdate, actor: AuditActor): Promise<ThemeDto> {
    await this.dataSource.transaction(async (manager) => {
      const { version, codeIds, excerpts, ...fields } = input
      const changes = Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== undefined))
      await updateWithVersion(manager, Theme, { id: themeId, studyId }, version, changes, 'theme')
      await this.setLinks(manager, studyId, themeId, codeIds, excerpts)
      await this.audit.record(actor, { action: 'theme.updated', studyId, targetType: 'theme', targetId: themeId, details: { changed: [...Object.keys(changes), ...(codeIds ? ['codes'] : []), ...(excerpts ? ['excerpts'] : [])] } }, manager)
    })
    return this.one(studyId, themeId)
  }

  async order(studyId: string, input: ThemeOrder, actor: AuditActor): Promise<ThemeDto[]> {
    await this.dataSource.transaction(async (manager) => {
      const themes = await manager.find(Theme, { where: { studyId }, select: { id: true }, lock: { mode: 'pessimistic_write' } })
      const known = new Set(themes.map((t) => t.id))
      if (input.order.length !== known.size || input.order.some((o) => !known.has(o.id) || (o.parentId !== null && (!known.has(o.parentId) || o.parentId === o.id))))
        throw new UnprocessableError('The order must list every theme of this study once, each under a theme of this study. Reload and try again.')
      const parentOf = new Map(input.order.map((o) => [o.id, o.parentId]))
      for (const o of input.order) {
        let at: string | null = o.parentId
        for (let depth = 0; at; depth++) {
          if (at === o.id || depth > 50) throw new UnprocessableError('A theme cannot sit inside itself or one of its own sub-themes.')
          at = parentOf.get(at) ?? null
        }
      }
      for (const o of input.order) await manager.query(`UPDATE themes SET parent_id = $2, position = $3, version = version + 1 WHERE id = $1`, [o.id, o.parentId, o.position])
      await this.audit.record(actor, { action: 'theme.reordered', studyId, targetType: 'study', targetId: studyId, details: { themes: input.order.length } }, manager)
    })
    return this.list(studyId)
  }

  async remove(studyId: string, themeId: string, version: number, actor: AuditActor): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const theme = await manager.findOneBy(Theme, { id: themeId, studyId })
      if (!theme) throw new NotFoundError('theme')
      const [open] = await manager.query(`SELECT r.title FROM review_round_themes rt JOIN review_rounds r ON r.id = rt.round_id WHERE rt.theme_id = $1 AND r.status = 'open' LIMIT 1`, [themeId])
      if (open) throw new ConflictError(`“${theme.name}” is in the open review round “${open.title}”. Close the round first; partners’ answers are kept.`)
      await updateWithVersion(manager, Theme, { id: themeId, studyId }, version, {}, 'theme')
      await manager.delete(Theme, { id: themeId })
      await this.audit.record(actor, { action: 'theme.deleted', studyId, targetType: 'theme', targetId: themeId, details: { name: theme.name } }, manager)
    })
  }

  private async setLinks(manager: EntityManager, studyId: string, themeId: string, codeIds?: string[], excerpts?: { excerptId: string; shareWithPartners: boolean }[]): Promise<void> {
    if (codeIds) {
      const found: { id: string }[] = codeIds.length ? await manager.query(`SELECT id FROM codes WHERE id = ANY($1::uuid[]) AND study_id = $2 AND status <> 'merged'`, [codeIds, studyId]) : []
      if (found.length !== new Set(codeIds).size) throw new UnprocessableError('One of the codes is not in this study’s codebook (or was merged). Reload and choose again.', [{ path: 'codeIds', message: 'Choose codes of this codebook.' }])
      await manager.delete(ThemeCode, { themeId })
      if (found.length) await manager.insert(ThemeCode, found.map((c) => ({ themeId, codeId: c.id })))
    }
    if (excerpts) {
      const ids = [...new Set(excerpts.map((e) => e.excerptId))]
      const found: { id: string }[] = ids.length ? await manager.query(`SELECT id FROM excerpts WHERE id = ANY($1::uuid[]) AND study_id = $2`, [ids, studyId]) : []
      if (found.length !== ids.length) throw new UnprocessableError('One of the excerpts is not in this study.', [{ path: 'excerpts', message: 'Choose excerpts of this study.' }])
      await manager.delete(ThemeExcerpt, { themeId })
      if (excerpts.length) await manager.insert(ThemeExcerpt, excerpts.map((e, position) => ({ themeId, excerptId: e.excerptId, shareWithPartners: e.shareWithPartners, position })))
    }
  }
}

function gradeOf(text: string): number | null {
  const result = text.trim() ? readability(text) : null
  return result ? Math.round(result.grade * 10) / 10 : null
}
