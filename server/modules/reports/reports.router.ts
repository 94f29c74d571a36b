import { Router, type Response } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { characteristicsQuery, checklistItemParams, checklistItemUpdate, checklistParams, exportQuery } from '../../../shared/schemas/reports.js'
import { attachment, sendCsv } from '../../lib/csv.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { CodebookTransferService } from '../coding/codebook-transfer.service.js'
import type { QuoteExportService } from './quote-export.service.js'
import type { ReportExportsService } from './report-exports.service.js'
import type { ReportsService } from './reports.service.js'

interface Deps {
  authorize: Authorize
  reports: ReportsService
  quotes: QuoteExportService
  exports: ReportExportsService
  codebook: CodebookTransferService
}

function startCsv(res: Response, filename: string): void {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8')
  res.setHeader('Content-Disposition', attachment(filename))
}

/** Reports as JSON under /reports, and every table as CSV under /exports/<name>.csv. */
export function reportsRouter({ authorize, reports, quotes, exports, codebook }: Deps) {
  const router = Router()
  const read = authorize('study:reports.read')
  router.get('/studies/:studyId/reports/characteristics', read, validate({ params: idParams, query: characteristicsQuery }), async (req, res) => {
    res.json(await reports.characteristics(req.valid.params.studyId, req.valid.query.minCell))
  })
  router.get('/studies/:studyId/reports/recruitment-flow', read, validate({ params: idParams }), async (req, res) => {
    res.json(await reports.flow(req.valid.params.studyId))
  })
  router.get('/studies/:studyId/reports/quotes-by-theme', read, validate({ params: idParams }), async (req, res) => {
    res.json(await quotes.report(req.valid.params.studyId))
  })
  router.get('/studies/:studyId/reports/checklists/:checklist', read, validate({ params: checklistParams }), async (req, res) => {
    res.json(await reports.checklist(req.valid.params.studyId, req.valid.params.checklist))
  })
  router.put('/studies/:studyId/reports/checklists/:checklist/items/:number', authorize('study:reports.manage'), validate({ params: checklistItemParams, body: checklistItemUpdate }), async (req, res) => {
    const { studyId, checklist, number } = req.valid.params
    res.json(await reports.saveChecklistItem(studyId, checklist, number, req.valid.body))
  })
  router.get('/studies/:studyId/reports/methods-summary', read, validate({ params: idParams }), async (req, res) => {
    res.json(await reports.methods(req.valid.params.studyId))
  })

  const csvQuery = { params: idParams, query: exportQuery }
  const bom = (q: z.infer<typeof exportQuery>) => q.bom === '1'
  router.get('/studies/:studyId/exports/characteristics.csv', read, validate(csvQuery), async (req, res) => {
    sendCsv(res, 'characteristics.csv', await exports.characteristics(req.valid.params.studyId, req.valid.query.minCell ?? 5, bom(req.valid.query)))
  })
  router.get('/studies/:studyId/exports/recruitment-flow.csv', read, validate(csvQuery), async (req, res) => {
    sendCsv(res, 'recruitment-flow.csv', await exports.flow(req.valid.params.studyId, bom(req.valid.query)))
  })
  router.get('/studies/:studyId/exports/quotes-by-theme.csv', read, validate(csvQuery), async (req, res) => {
    startCsv(res, 'quotes-by-theme.csv')
    await quotes.csv(req.valid.params.studyId, res, bom(req.valid.query))
    res.end()
  })
  router.get('/studies/:studyId/exports/codebook.csv', authorize('study:codebook.read'), validate(csvQuery), async (req, res) => {
    sendCsv(res, 'codebook.csv', await codebook.csv(req.valid.params.studyId, bom(req.valid.query)))
  })
  for (const name of ['coreq', 'srqr'] as const) {
    router.get(`/studies/:studyId/exports/${name}.csv`, read, validate(csvQuery), async (req, res) => {
      sendCsv(res, `${name}.csv`, await exports.checklist(req.valid.params.studyId, name, bom(req.valid.query)))
    })
  }
  router.get('/studies/:studyId/exports/audit.csv', authorize('study:audit.read'), validate(csvQuery), async (req, res) => {
    startCsv(res, 'audit-trail.csv')
    await exports.auditTrail(req.valid.params.studyId, res, bom(req.valid.query), actorOf(req))
    res.end()
  })
  return router
}
