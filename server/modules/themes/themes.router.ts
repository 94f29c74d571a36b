import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { themeCreate, themeOrder, themeParams, themeUpdate } from '../../../shared/schemas/themes.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { ThemeService } from './theme.service.js'

const versionQuery = z.strictObject({ version: z.coerce.number().int().min(1) })

/** Themes: the team's overview and the lead's editing. */
export function themesRouter({ authorize, themes }: { authorize: Authorize; themes: ThemeService }) {
  const router = Router()
  router.get('/studies/:studyId/themes', authorize('study:themes.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ themes: await themes.list(req.valid.params.studyId) })
  })
  router.post('/studies/:studyId/themes', authorize('study:themes.manage'), validate({ params: idParams, body: themeCreate }), async (req, res) => {
    res.status(201).json(await themes.create(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  router.put('/studies/:studyId/themes/order', authorize('study:themes.manage'), validate({ params: idParams, body: themeOrder }), async (req, res) => {
    res.json({ themes: await themes.order(req.valid.params.studyId, req.valid.body, actorOf(req)) })
  })
  router.patch('/studies/:studyId/themes/:themeId', authorize('study:themes.manage'), validate({ params: themeParams, body: themeUpdate }), async (req, res) => {
    res.json(await themes.update(req.valid.params.studyId, req.valid.params.themeId, req.valid.body, actorOf(req)))
  })
  router.delete('/studies/:studyId/themes/:themeId', authorize('study:themes.manage'), validate({ params: themeParams, query: versionQuery }), async (req, res) => {
    await themes.remove(req.valid.params.studyId, req.valid.params.themeId, req.valid.query.version, actorOf(req))
    res.status(204).end()
  })
  return router
}
