import { IsNull, type DataSource, type EntityManager } from 'typeorm'
import { readability } from '../../../shared/readability/index.js'
import type { Theme as ThemeDto, ThemeCreate, ThemeOrder, ThemeStatus, ThemeUpdate } from '../../../shared/schemas/themes.js'
import { ConflictError, NotFoundError, UnprocessableError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { CodingScope } from '../coding/coding-scope.js'
import { updateWithVersion } from '../coding/versioned-update.js'
import { Theme, ThemeCode, ThemeExcerpt } from './theme.entity.js'

interface ThemeRow {
  id: string
  parent_id: string | null
  position: number
  name: string
  description: string
  plain_description: string
  status: ThemeStatus
  version: number
  updated_at: Date
  code_ids: string[]
  support_excerpts: number | null
  support_participants: number | null
  in_open_round: boolean
}

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
  ) {}

  /**
   * Every theme with its codes, support, chosen excerpts and whether an open review round holds it:
   * whose data may be used first (the consent policy, which also says whether partners may see a
   * participant's excerpts), then the themes and their chosen excerpts in two plain statements side
   * by side (the themes page and the coding view's theme panel read this on every visit).
   */
  async list(studyId: string): Promise<ThemeDto[]> {
    const { usable, uses } = await this.scope.usableWithDataUse(studyId)
    const [themes, chosen] = await Promise.all([
      this.dataSource.query(
        `SELECT t.id, t.parent_id, t.position, t.name, t.description, t.plain_description, t.status, t.version, t.updated_at,
                (SELECT coalesce(array_agg(tc.code_id), '{}') FROM theme_codes tc WHERE tc.theme_id = t.id) AS code_ids,
                s.excerpts AS support_excerpts, s.participants AS support_participants,
                EXISTS (SELECT 1 FROM review_round_themes rt JOIN review_rounds r ON r.id = rt.round_id WHERE rt.theme_id = t.id AND r.study_id = $1 AND r.status = 'open') AS in_open_round
           FROM themes t
           LEFT JOIN (SELECT tc.theme_id, count(DISTINCT e.id)::int AS excerpts, count(DISTINCT e.participant_id)::int AS participants
                        FROM theme_codes tc JOIN themes th ON th.id = tc.theme_id JOIN excerpt_codes x ON x.code_id = tc.code_id JOIN excerpts e ON e.id = x.excerpt_id
                       WHERE th.study_id = $1 AND e.participant_id = ANY($2::uuid[]) GROUP BY tc.theme_id) s ON s.theme_id = t.id
          WHERE t.study_id = $1
          ORDER BY t.position ASC, t.created_at ASC`,
        [studyId, usable],
      ) as Promise<ThemeRow[]>,
      this.dataSource.query(
        `SELECT te.theme_id, te.excerpt_id, te.share_with_partners, e.text, e.transcript_id, e.start_offset, e.participant_id, p.pseudonym
           FROM theme_excerpts te JOIN themes th ON th.id = te.theme_id JOIN excerpts e ON e.id = te.excerpt_id JOIN participants p ON p.id = e.participant_id
          WHERE th.study_id = $1 AND e.participant_id = ANY($2::uuid[]) ORDER BY te.position`,
        [studyId, usable],
      ) as Promise<{ theme_id: string; excerpt_id: string; share_with_partners: boolean; text: string; transcript_id: string; start_offset: number; participant_id: string; pseudonym: string }[]>,
    ])
    return themes.map((t) => ({
      id: t.id,
      parentId: t.parent_id,
      position: t.position,
      name: t.name,
      description: t.description,
      plainDescription: t.plain_description,
      plainGrade: gradeOf(t.plain_description),
      status: t.status,
      codeIds: t.code_ids,
      excerpts: chosen
        .filter((c) => c.theme_id === t.id)
        .map((c) => ({ excerptId: c.excerpt_id, shareWithPartners: c.share_with_partners, text: c.text, pseudonym: c.pseudonym, transcriptId: c.transcript_id, start: c.start_offset, mayShowPartners: uses.get(c.participant_id)?.mayShowPartners ?? false })),
      support: t.support_excerpts === null ? { participants: 0, excerpts: 0 } : { participants: t.support_participants!, excerpts: t.support_excerpts },
      inOpenRound: t.in_open_round,
      version: t.version,
      updatedAt: new Date(t.updated_at).toISOString(),
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

/** grades already worked out, by text (first in, first out): the same descriptions are graded on every list */
const grades = new Map<string, number | null>()

function gradeOf(text: string): number | null {
  const known = grades.get(text)
  if (known !== undefined) return known
  const result = text.trim() ? readability(text) : null
  const grade = result ? Math.round(result.grade * 10) / 10 : null
  if (grades.size >= 1000) grades.delete(grades.keys().next().value!)
  grades.set(text, grade)
  return grade
}
