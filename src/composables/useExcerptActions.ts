import { ref, type MaybeRefOrGetter } from 'vue'
import { OKABE_ITO, type Code, type Excerpt } from '@shared/schemas/coding'
import { normaliseRange } from '@shared/coding/offsets'
import { wordStep, type Span } from '@shared/coding/segments'
import { useCreateCodeMutation } from '@/api/codebook'
import { useCreateExcerptMutation, useDeleteExcerptMutation, useUpdateExcerptMutation } from '@/api/coding'
import { ApiError, messageOf } from '@/api/errors'
import { useNotificationsStore } from '@/stores/notifications'

export type ExcerptResize = 'start-earlier' | 'start-later' | 'end-earlier' | 'end-later' | 'selection'
export interface CodeChoice {
  codeIds: string[]
  newLabels: string[]
}

export const STALE_EXCERPT = 'Someone changed this excerpt since you loaded it (perhaps you, in another tab), so it has been reloaded. Check it and make your change again.'

/** A readable sentence for a failed excerpt change: a stale version, the server's own reason, or anything else. */
export function excerptProblem(error: unknown): string {
  if (error instanceof ApiError && error.status === 409) return STALE_EXCERPT
  if (error instanceof ApiError && error.status === 422 && error.errors.length) return error.errors.map((e) => e.message).join(' ')
  return messageOf(error)
}

/** The colour used least among the active codes, so a new code stands apart from its neighbours. */
function freshColour(codes: Code[]): string {
  const uses = new Map<string, number>(OKABE_ITO.map((c) => [c.hex, 0]))
  for (const code of codes) if (code.status === 'active' && uses.has(code.colour)) uses.set(code.colour, uses.get(code.colour)! + 1)
  return [...uses].sort((a, b) => a[1] - b[1])[0]![0]
}

/**
 * Adding, recoding, resizing and removing your excerpts. Every change carries the excerpt's
 * version; a 409 says someone changed it and the list reloads (the mutations refresh it either way).
 */
export function useExcerptActions(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>, text: () => string, codes: () => Code[]) {
  const notifications = useNotificationsStore()
  const creating = useCreateExcerptMutation(studyId, transcriptId)
  const updating = useUpdateExcerptMutation(studyId, transcriptId)
  const deleting = useDeleteExcerptMutation(studyId, transcriptId)
  const makingCode = useCreateCodeMutation(studyId)
  const busyId = ref<string | null>(null)
  const busy = ref(false)

  async function codeIdsOf(choice: CodeChoice): Promise<string[]> {
    const made: string[] = []
    for (const label of choice.newLabels) {
      const code = await makingCode.mutateAsync({ label, colour: freshColour(codes()), parentId: null })
      made.push(code.id)
    }
    return [...choice.codeIds, ...made]
  }

  async function run(excerptId: string | null, work: () => Promise<string>): Promise<boolean> {
    busy.value = true
    busyId.value = excerptId
    try {
      notifications.success(await work())
      return true
    } catch (error) {
      notifications.failure(excerptProblem(error))
      return false
    } finally {
      busy.value = false
      busyId.value = null
    }
  }

  const labelsOf = (ids: string[]) => ids.map((id) => codes().find((c) => c.id === id)?.label ?? 'a new code').join(', ')

  function create(span: Span, choice: CodeChoice): Promise<boolean> {
    const range = normaliseRange(text(), span.start, span.end)
    if (!range) {
      notifications.notify('The selection holds only spaces. Select some words to code.')
      return Promise.resolve(false)
    }
    return run(null, async () => {
      const codeIds = await codeIdsOf(choice)
      const saved = await creating.mutateAsync({ start: range.start, end: range.end, text: text().slice(range.start, range.end), codeIds })
      return `Coded as ${labelsOf(saved.codeIds)}.`
    })
  }

  function recode(excerpt: Excerpt, choice: CodeChoice): Promise<boolean> {
    return run(excerpt.id, async () => {
      const codeIds = await codeIdsOf(choice)
      await updating.mutateAsync({ excerptId: excerpt.id, body: { version: excerpt.version, codeIds } })
      return `The excerpt is now coded ${labelsOf(codeIds)}.`
    })
  }

  /** The range an excerpt would take after a resize, or null when it would be empty or unchanged. */
  function resized(excerpt: Excerpt, change: ExcerptResize, selection: Span | null): Span | null {
    const whole = text()
    let { start, end } = excerpt
    if (change === 'selection') {
      if (!selection) return null
      ;({ start, end } = selection)
    } else if (change === 'start-earlier') start = wordStep(whole, start, -1)
    else if (change === 'start-later') start = wordStep(whole, start, 1)
    else if (change === 'end-earlier') end = wordStep(whole, end, -1)
    else end = wordStep(whole, end, 1)
    const range = start < end ? normaliseRange(whole, start, end) : null
    return range && (range.start !== excerpt.start || range.end !== excerpt.end) ? range : null
  }

  function resize(excerpt: Excerpt, change: ExcerptResize, selection: Span | null): Promise<boolean> {
    const range = resized(excerpt, change, selection)
    if (!range) {
      notifications.notify('The excerpt cannot get any smaller or larger that way: it would be empty or stay the same.')
      return Promise.resolve(false)
    }
    return run(excerpt.id, async () => {
      const body = { version: excerpt.version, start: range.start, end: range.end, text: text().slice(range.start, range.end) }
      await updating.mutateAsync({ excerptId: excerpt.id, body })
      return 'The excerpt now covers the new passage.'
    })
  }

  function remove(excerpt: Excerpt): Promise<boolean> {
    return run(excerpt.id, async () => {
      await deleting.mutateAsync({ excerptId: excerpt.id, version: excerpt.version })
      return 'The excerpt is removed. The transcript text is unchanged.'
    })
  }

  return { create, recode, resize, remove, busy, busyId }
}
