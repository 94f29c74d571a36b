import { Foundation1796149782369 } from './1796149782369-Foundation.js'
import { Recruitment1796151704694 } from './1796151704694-Recruitment.js'
import { Consent1796152773826 } from './1796152773826-Consent.js'
import { InterviewsTranscripts1796153161375 } from './1796153161375-InterviewsTranscripts.js'
import { DataRemovalGrace1796154124035 } from './1796154124035-DataRemovalGrace.js'
import { DeidentificationTerms1796155275375 } from './1796155275375-DeidentificationTerms.js'
import { Coding1796157377152 } from './1796157377152-Coding.js'
import { AgreementSettings1796159637143 } from './1796159637143-AgreementSettings.js'
import { ThemesReview1796161242004 } from './1796161242004-ThemesReview.js'
import { ReportingChecklists1796162709975 } from './1796162709975-ReportingChecklists.js'

/** Every migration class in order; listed, never globbed. */
export const migrations = [Foundation1796149782369, Recruitment1796151704694, Consent1796152773826, InterviewsTranscripts1796153161375, DataRemovalGrace1796154124035, DeidentificationTerms1796155275375, Coding1796157377152, AgreementSettings1796159637143, ThemesReview1796161242004, ReportingChecklists1796162709975]
