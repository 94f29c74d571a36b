/**
 * `npm run bench`: every benchmark, each printing a ratio against a baseline measured in the same run.
 * `npm run bench -- scan`, `-- api`, `-- apply-code`, `-- coding-view`, `-- agreement`, `-- quotes-export` or `-- load` runs one.
 */
import { runAgreement } from './agreement.js'
import { runApiThroughput } from './api-throughput.js'
import { runApplyCode } from './apply-code.js'
import { runCodingView } from './coding-view.js'
import { runLoad } from './load.js'
import { runQuotesExport } from './quotes-export.js'
import { runTranscriptScan } from './transcript-scan.js'

const only = process.argv[2]
if (!only || only === 'scan') await runTranscriptScan()
if (!only || only === 'api') await runApiThroughput()
if (!only || only === 'apply-code') await runApplyCode()
if (!only || only === 'coding-view') await runCodingView()
if (!only || only === 'agreement') await runAgreement()
if (!only || only === 'quotes-export') await runQuotesExport()
if (!only || only === 'load') await runLoad()
process.exit(0)
