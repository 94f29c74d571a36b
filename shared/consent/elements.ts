/**
 * What a consent form must cover: the data behind the lead's checklist. Labels and details are our
 * own paraphrases. Where both sources ask for the same thing it is one item naming both.
 *
 * The US list is the basic elements of 45 CFR 46.116(b), recalled from memory (not re-read); the
 * additional elements of 46.116(c) apply only "when appropriate" and are mentioned in a detail
 * where they meet a Canadian item, not listed as US requirements. The Canadian list follows
 * TCPS 2 (2022) Article 3.2 as paraphrased in our check-values reference, section 6.
 */
export type ConsentElementSource = 'common_rule' | 'tcps2'

export interface ConsentElement {
  /** stable lower_snake_case key, stored in a form version's checklist */
  key: string
  label: string
  sources: ConsentElementSource[]
  detail: string
}

export const CONSENT_ELEMENT_SOURCES: Record<ConsentElementSource, { name: string; citation: string }> = {
  common_rule: {
    name: 'US Common Rule',
    citation: 'Federal Policy for the Protection of Human Subjects ("Common Rule"), 45 CFR 46.116(b), basic elements of informed consent (revised rule, 2018)',
  },
  tcps2: {
    name: 'Canada TCPS 2',
    citation:
      'Canadian Institutes of Health Research, Natural Sciences and Engineering Research Council of Canada and Social Sciences and Humanities Research Council, Tri-Council Policy Statement: Ethical Conduct for Research Involving Humans — TCPS 2 (2022), Chapter 3, Article 3.2',
  },
}

export const CONSENT_ELEMENTS: ConsentElement[] = [
  {
    key: 'research_and_purpose',
    label: 'It is research, and why it is being done',
    sources: ['common_rule', 'tcps2'],
    detail: 'Say plainly that this is an invitation to take part in research, and what the study wants to find out.',
  },
  {
    key: 'procedures_and_duration',
    label: 'What taking part involves and how long it takes',
    sources: ['common_rule', 'tcps2'],
    detail: 'Describe each step (for example an interview, its length, whether it is recorded) and how much of the person’s time the study needs.',
  },
  {
    key: 'researchers_and_funder',
    label: 'Who runs the study and who pays for it',
    sources: ['tcps2'],
    detail: 'Name the researchers and their organisation, and the funder of the study.',
  },
  {
    key: 'risks',
    label: 'Risks and discomforts',
    sources: ['common_rule', 'tcps2'],
    detail: 'Describe the harms or discomforts that can be foreseen, such as distress when talking about illness.',
  },
  {
    key: 'benefits',
    label: 'Possible benefits',
    sources: ['common_rule', 'tcps2'],
    detail: 'Say what benefit the person or others may reasonably expect, including when there is no direct benefit.',
  },
  {
    key: 'alternatives',
    label: 'Other options besides taking part',
    sources: ['common_rule'],
    detail: 'Where it applies, describe other courses of action or treatment that might help the person.',
  },
  {
    key: 'data_and_confidentiality',
    label: 'What information is collected, who sees it and how it is kept private',
    sources: ['common_rule', 'tcps2'],
    detail: 'List the information collected, who can see identifying details, and how records are protected.',
  },
  {
    key: 'injury_compensation',
    label: 'Care and compensation if harmed',
    sources: ['common_rule'],
    detail: 'For studies above minimal risk: whether treatment or compensation is available if the person is harmed, and where to learn more.',
  },
  {
    key: 'contacts',
    label: 'Whom to contact with questions or concerns',
    sources: ['common_rule', 'tcps2'],
    detail: 'Give a contact on the study team and an independent contact at the ethics board for questions about the person’s rights.',
  },
  {
    key: 'voluntary_participation',
    label: 'Taking part is a free choice and can stop at any time',
    sources: ['common_rule', 'tcps2'],
    detail: 'Say that saying no, or stopping later, brings no penalty and no loss of care or other benefits.',
  },
  {
    key: 'data_withdrawal',
    label: 'Asking for data to be withdrawn, and the limits',
    sources: ['tcps2'],
    detail:
      'Explain how to ask for data to be removed and any practical limits (for example a deadline, group interviews, published results). The Common Rule lists the consequences of withdrawing as an additional element, 46.116(c).',
  },
  {
    key: 'future_use',
    label: 'Future use of the information',
    sources: ['common_rule'],
    detail: 'Say whether identifiable information may be stripped of identifiers and used or shared for future research without asking again.',
  },
  {
    key: 'commercial_use_and_conflicts',
    label: 'Commercial use and conflicts of interest',
    sources: ['tcps2'],
    detail: 'Say whether the results could be used for profit, and declare any real or possible conflicts of interest of the researchers.',
  },
  {
    key: 'sharing_results',
    label: 'How results will be shared, and whether anyone could be recognised',
    sources: ['tcps2'],
    detail: 'Describe the reports and articles that will share the findings, whether quotes will be used, and whether participants could be identified.',
  },
  {
    key: 'payments',
    label: 'Payments or expenses',
    sources: ['tcps2'],
    detail: 'State any payment, gift or repaid costs for taking part.',
  },
  {
    key: 'legal_rights',
    label: 'No loss of legal rights',
    sources: ['tcps2'],
    detail: 'Say that agreeing to take part does not waive any legal rights.',
  },
]
