import { Router, type Request } from 'express'
import type { Pool } from 'pg'
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible'
import { z } from 'zod'
import { publicEnquiry, type PublicEnquiryResult, type PublicStudy } from '../../../shared/schemas/recruitment.js'
import { ConflictError, NotFoundError, TooManyRequestsError } from '../../lib/errors.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { Study } from '../studies/study.entity.js'
import type { DataSource } from 'typeorm'
import type { ParticipantService } from './participant.service.js'
import type { QuestionnaireService } from './questionnaire.service.js'

const codeParams = z.strictObject({ code: z.string().trim().min(2).max(20).regex(/^[A-Za-z0-9-]+$/).transform((c) => c.toUpperCase()) })

/**
 * The public study page's API, for people without an account. Submissions are rate-limited per
 * address in PostgreSQL (shared by every app instance) and carry a honeypot field.
 */
export function publicRouter(deps: { authorize: Authorize; dataSource: DataSource; pool: Pool; participants: ParticipantService; questionnaires: QuestionnaireService; perHour: number }) {
  const { authorize, dataSource, participants, questionnaires } = deps
  const limiter = new RateLimiterPostgres({ storeClient: deps.pool, tableName: 'rate_limits', tableCreated: true, keyPrefix: 'public-enquiry', points: deps.perHour, duration: 3600 })
  const router = Router()

  async function studyByCode(code: string): Promise<Study> {
    const study = await dataSource.getRepository(Study).findOneBy({ code })
    if (!study) throw new NotFoundError('study with this code. Check the link you were given')
    return study
  }

  router.get('/public/studies/:code', authorize('public'), validate({ params: codeParams }), async (req, res) => {
    const study = await studyByCode(req.valid.params.code)
    const questionnaire = await questionnaires.currentEntity(study.id)
    const body: PublicStudy = {
      code: study.code,
      title: study.title,
      publicSummary: study.publicSummary,
      whoCanTakePart: study.whoCanTakePart,
      recruiting: study.recruiting && Boolean(questionnaire),
      questionnaire: questionnaire ? { version: questionnaire.version, intro: questionnaire.intro, questions: questionnaire.questions } : null,
    }
    res.json(body)
  })

  router.post('/public/studies/:code/enquiries', authorize('public'), validate({ params: codeParams, body: publicEnquiry }), async (req: Request, res) => {
    await limiter.consume(req.ip ?? 'unknown').catch((state: unknown) => {
      if (state instanceof RateLimiterRes) {
        throw new TooManyRequestsError('Too many answers were sent from this connection. Please try again in an hour.', Math.ceil(state.msBeforeNext / 1000))
      }
      throw state
    })
    const study = await studyByCode(req.valid.params.code)
    if (!study.recruiting) throw new ConflictError('This study is not taking new enquiries at the moment. Thank you for your interest.')
    const input = req.valid.body
    if (input.website) {
      // a robot filled the hidden field: answer as usual, keep nothing
      const body: PublicEnquiryResult = { outcome: 'needs_review', studyTitle: study.title, resources: [] }
      return res.status(201).json(body)
    }
    const { result } = await participants.create(
      study.id,
      { contact: input.contact, consentToContact: input.consentToContact, source: 'public_page', answers: input.answers },
      { id: null, email: null, ip: req.ip ?? null },
      { strictAnswers: true },
    )
    const outcome = result!.helpSeeking ? 'help_seeking' : result!.outcome
    const body: PublicEnquiryResult = {
      outcome,
      studyTitle: study.title,
      resources: outcome === 'not_eligible' || outcome === 'help_seeking' ? study.resources : [],
    }
    res.status(201).json(body)
  })

  return router
}
