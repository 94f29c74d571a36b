import type { ConsentRecord as ConsentRecordDto, Withdrawal as WithdrawalDto } from '../../../shared/schemas/consent.js'
import type { ConsentForm } from './consent-form.entity.js'
import type { ConsentRecord } from './consent-record.entity.js'
import type { Withdrawal } from './withdrawal.entity.js'

/** The record in force: the newest one that no later record corrects. */
export function currentRecord<T extends Pick<ConsentRecord, 'id' | 'correctsId' | 'createdAt'>>(records: T[]): T | null {
  const corrected = new Set(records.map((r) => r.correctsId).filter(Boolean))
  const live = records.filter((r) => !corrected.has(r.id)).sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime())
  return live[0] ?? null
}

export function toRecordDto(r: ConsentRecord, form: ConsentForm, all: ConsentRecord[]): ConsentRecordDto {
  return {
    id: r.id,
    participantId: r.participantId,
    formId: r.formId,
    formLabel: form.label,
    formStatus: form.status,
    method: r.method,
    clauses: r.clauses,
    signerName: r.signerName,
    signedAt: r.signedAt.toISOString(),
    meaning: r.meaning,
    obtainedBy: r.obtainedByName,
    witnessName: r.witnessName,
    documentSha256: r.documentSha256,
    signedFileName: r.signedFileName,
    corrects: r.correctsId,
    correctedBy: all.find((x) => x.correctsId === r.id)?.id ?? null,
    note: r.note,
  }
}

export function toWithdrawalDto(w: Withdrawal): WithdrawalDto {
  return {
    id: w.id,
    scope: w.scope,
    effectiveDate: w.effectiveDate,
    reason: w.reason,
    dataRemoved: w.dataRemoved,
    withinDeadline: w.withinDeadline,
    decisionNote: w.decisionNote,
    recordedBy: w.recordedByName,
    recordedAt: w.createdAt.toISOString(),
  }
}

export function meaningFor(method: 'written' | 'verbal' | 'electronic', formLabel: string, obtainedBy: string | null, witness: string): string {
  if (method === 'electronic') return `Signed electronically by the participant, agreeing to take part under consent form version ${formLabel}`
  if (method === 'written') return `Signed on paper by the participant, agreeing to take part under consent form version ${formLabel}; scan uploaded by ${obtainedBy ?? 'the team'}`
  return `Verbal agreement to take part under consent form version ${formLabel}, recorded by ${obtainedBy ?? 'the team'}${witness ? `, witnessed by ${witness}` : ''}`
}
