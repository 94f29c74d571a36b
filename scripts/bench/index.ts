/**
 * `npm run bench`: every benchmark, each printing a ratio against a baseline measured in the same run.
 * `npm run bench -- scan` or `-- api` runs one.
 */
import { runApiThroughput } from './api-throughput.js'
import { runTranscriptScan } from './transcript-scan.js'

const only = process.argv[2]
if (!only || only === 'scan') await runTranscriptScan()
if (!only || only === 'api') await runApiThroughput()
process.exit(0)
