import { useQuery } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import { auditPage, type AuditPage, type AuditQuery } from '@shared/schemas/audit'
import { http, segment } from './http'

export type AuditFilter = Pick<AuditQuery, 'page' | 'pageSize' | 'action' | 'actor'>

export const auditKeys = {
  page: (studyId: string, filter: AuditFilter) =>
    [studyId ? 'studies' : 'site', studyId, 'audit', filter.page, filter.pageSize, filter.action ?? '', filter.actor ?? ''] as const,
}

/** A study's trail; with no study, the site-wide trail (site administrator). */
export const fetchAuditPage = (studyId: string, filter: AuditFilter): Promise<AuditPage> =>
  http.get(studyId ? `/studies/${segment(studyId)}/audit` : '/audit', auditPage, { ...filter })

export function useAuditPageQuery(studyId: MaybeRefOrGetter<string>, filter: MaybeRefOrGetter<AuditFilter>) {
  return useQuery({
    key: () => auditKeys.page(toValue(studyId), toValue(filter)),
    query: () => fetchAuditPage(toValue(studyId), toValue(filter)),
    // Keep the previous page on screen while the next one loads.
    placeholderData: (previous: AuditPage | undefined) => previous,
  })
}
