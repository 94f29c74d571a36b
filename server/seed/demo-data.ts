import type { StudyRole } from '../../shared/permissions.js'

/**
 * The invented demo study "Coming Home After Stroke": a fictional school of nursing asks family
 * caregivers what they wish they had known at hospital discharge. Every person here is invented.
 */
export const DEMO_PASSWORD = 'listen-with-care-2026'

export const DEMO_STUDY = {
  code: 'CHAS',
  title: 'Coming Home After Stroke',
  summary:
    'Family caregivers describe what they wish they had known when their relative left hospital after a stroke. ' +
    'Semi-structured interviews with caregivers in three regions, analysed thematically with a patient partner on the team.',
  ethicsBoard: 'Northbridge School of Nursing Research Ethics Board',
  ethicsReference: 'NSN-REB-2026-014',
  approvalDate: '2026-02-02',
  approvalExpiry: '2027-01-20',
  targetSampleSize: 12,
}

export const DEMO_ADMIN = { email: 'admin@heardwell.test', name: 'Dana Whitlow' }

export const DEMO_TEAM: { email: string; name: string; role: StudyRole }[] = [
  { email: 'lead@heardwell.test', name: 'Ilse Marrow', role: 'lead' },
  { email: 'coordinator@heardwell.test', name: 'Tomas Reyne', role: 'coordinator' },
  { email: 'coder1@heardwell.test', name: 'Priya Salden', role: 'coder' },
  { email: 'coder2@heardwell.test', name: 'Jun Halvard', role: 'coder' },
  { email: 'partner@heardwell.test', name: 'Wren Castellane', role: 'partner' },
]
