import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { ThemeStatus } from '../../../shared/schemas/themes.js'
import { Code } from '../coding/code.entity.js'
import { Excerpt } from '../coding/excerpt.entity.js'
import { Study } from '../studies/study.entity.js'

/** A theme: an analytic description for the team, a plain-language one for partners, its codes and chosen excerpts. */
@Entity('themes')
@Index(['studyId', 'parentId', 'position'])
export class Theme extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'parent_id', nullable: true })
  parentId: string | null

  @Column({ type: 'integer', default: 0 })
  position: number

  @Column({ type: 'varchar', length: 120 })
  name: string

  @Column({ type: 'text', default: '' })
  description: string

  @Column({ type: 'text', name: 'plain_description', default: '' })
  plainDescription: string

  @Column({ type: 'varchar', length: 20, default: 'draft' })
  status: ThemeStatus

  @Column({ type: 'integer', default: 1 })
  version: number

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>

  @ManyToOne(() => Theme, { onDelete: 'SET NULL' })
  @JoinColumn({ name: 'parent_id' })
  parent: Relation<Theme> | null
}

/** A code a theme draws on. */
@Entity('theme_codes')
export class ThemeCode {
  @PrimaryColumn({ type: 'uuid', name: 'theme_id' })
  themeId: string

  @PrimaryColumn({ type: 'uuid', name: 'code_id' })
  codeId: string

  @ManyToOne(() => Theme, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'theme_id' })
  theme: Relation<Theme>

  @ManyToOne(() => Code, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'code_id' })
  code: Relation<Code>
}

/** A supporting excerpt the lead chose, and whether partners may see it (consent still decides). */
@Entity('theme_excerpts')
export class ThemeExcerpt {
  @PrimaryColumn({ type: 'uuid', name: 'theme_id' })
  themeId: string

  @PrimaryColumn({ type: 'uuid', name: 'excerpt_id' })
  excerptId: string

  @Column({ type: 'boolean', name: 'share_with_partners', default: false })
  shareWithPartners: boolean

  @Column({ type: 'integer', default: 0 })
  position: number

  @ManyToOne(() => Theme, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'theme_id' })
  theme: Relation<Theme>

  @ManyToOne(() => Excerpt, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'excerpt_id' })
  excerpt: Relation<Excerpt>
}
