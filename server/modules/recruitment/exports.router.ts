import { Router } from 'express'
import { z } from 'zod'
import { can } from '../../../shared/permissions.js'
import { idParams } from '../../../shared/schemas/common.js'
import { attachment } from '../../lib/csv.js'
import { ForbiddenError } from '../../lib/errors.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { ScreeningLogService } from './screening-log.service.js'

const exportQuery = z.strictObject({ contacts: z.enum(['true', 'false']).default('false') })

export function exportsRouter({ authorize, screeningLog }: { authorize: Authorize; screeningLog: ScreeningLogService }) {
  const router = Router()
  router.get(
    '/studies/:studyId/exports/screening-log.csv',
    authorize('study:exports.screeningLog'),
    validate({ params: idParams, query: exportQuery }),
    async (req, res) => {
      const withContacts = req.valid.query.contacts === 'true'
      if (withContacts && !can(req.studyRole, false, 'exports.contacts')) {
        throw new ForbiddenError('Only the lead researcher can export contact details.')
      }
      const { filename, body } = await screeningLog.csv(req.valid.params.studyId, withContacts, actorOf(req))
      res.setHeader('Content-Type', 'text/csv; charset=utf-8')
      res.setHeader('Content-Disposition', attachment(filename))
      res.send(body)
    },
  )
  return router
}
