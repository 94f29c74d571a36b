import type { ConsentService } from '../consent/consent.service.js'

/**
 * Whose data coding may touch: the consent policy (shared/consent/data-use-policy.ts) decides, through
 * ConsentService.dataUseFor. Excerpts of participants whose data may not be used are never shown,
 * counted or searched.
 */
export class CodingScope {
  constructor(private readonly consent: ConsentService) {}

  /** Participants with an approved transcript in the study whose data may be coded. */
  async usableParticipants(studyId: string): Promise<string[]> {
    return usableOf(await this.consent.dataUseOfTranscribed(studyId))
  }

  /**
   * The same, with the whole data-use policy of every participant with an approved transcript (for a
   * caller that also needs, say, whether a participant's excerpts may be shown to partners).
   */
  async usableWithDataUse(studyId: string): Promise<{ usable: string[]; uses: Awaited<ReturnType<ConsentService['dataUseOfTranscribed']>> }> {
    const uses = await this.consent.dataUseOfTranscribed(studyId)
    return { usable: usableOf(uses), uses }
  }

  async mayCode(studyId: string, participantId: string): Promise<boolean> {
    const uses = await this.consent.dataUseFor(studyId, [participantId])
    return uses.get(participantId)?.mayCode ?? false
  }
}

function usableOf(uses: Awaited<ReturnType<ConsentService['dataUseOfTranscribed']>>): string[] {
  return [...uses].filter(([, use]) => use.mayCode).map(([id]) => id)
}
