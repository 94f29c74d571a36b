import type { DataSource } from 'typeorm'
import type { ConsentSummary } from '../../../shared/schemas/consent.js'
import { NotFoundError } from '../../lib/errors.js'
import { Participant } from '../recruitment/participant.entity.js'
import { Study } from '../studies/study.entity.js'
import { ConsentForm } from './consent-form.entity.js'
import { ConsentLink } from './consent-link.entity.js'
import { ConsentRecord } from './consent-record.entity.js'
import { currentRecord } from './consent-views.js'
import { Withdrawal } from './withdrawal.entity.js'
import type { WithdrawalService } from './withdrawal.service.js'

/** The consent dashboard: consented per version, the re-consent queue, waiting links, withdrawals. */
export class ConsentSummaryService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly withdrawals: WithdrawalService,
  ) {}

  async summary(studyId: string): Promise<ConsentSummary> {
    const manager = this.dataSource.manager
    const study = await manager.findOneBy(Study, { id: studyId })
    if (!study) throw new NotFoundError('study')
    const [forms, participants, records, links, withdrawals] = await Promise.all([
      manager.find(ConsentForm, { where: { studyId }, order: { createdAt: 'ASC' } }),
      manager.findBy(Participant, { studyId }),
      manager.findBy(ConsentRecord, { studyId }),
      manager.findBy(ConsentLink, { studyId }),
      manager.findBy(Withdrawal, { studyId }),
    ])
    const formById = new Map(forms.map((f) => [f.id, f]))
    const now = new Date()
    const waiting = links.filter((l) => !l.usedAt && !l.revokedAt && l.expiresAt > now)
    const currentByParticipant = new Map<string, ConsentRecord>()
    for (const p of participants.filter((x) => x.status === 'consented')) {
      const current = currentRecord(records.filter((r) => r.participantId === p.id))
      if (current) currentByParticipant.set(p.id, current)
    }
    const pseudonym = new Map(participants.map((p) => [p.id, p.pseudonym]))
    return {
      ethicsExpiry: study.approvalExpiry,
      perVersion: forms.map((f) => ({
        formId: f.id,
        label: f.label,
        status: f.status,
        consented: [...currentByParticipant.values()].filter((r) => r.formId === f.id).length,
      })),
      reconsentQueue: [...currentByParticipant]
        .filter(([, r]) => formById.get(r.formId)?.status === 'superseded')
        .map(([participantId, r]) => ({
          participantId,
          pseudonym: pseudonym.get(participantId)!,
          formLabel: formById.get(r.formId)!.label,
          linkWaiting: waiting.some((l) => l.participantId === participantId),
        }))
        .sort((a, b) => a.pseudonym.localeCompare(b.pseudonym)),
      waitingLinks: waiting.map((l) => ({
        participantId: l.participantId,
        pseudonym: pseudonym.get(l.participantId) ?? '',
        formLabel: formById.get(l.formId)?.label ?? '',
        sentAt: l.createdAt.toISOString(),
        expiresAt: l.expiresAt.toISOString(),
      })),
      withdrawals: withdrawals.map((w) => ({ participantId: w.participantId, pseudonym: pseudonym.get(w.participantId) ?? '', scope: w.scope, effectiveDate: w.effectiveDate, dataRemoved: w.dataRemoved })),
      withdrawalRequests: await this.withdrawals.openRequests(studyId),
    }
  }
}
