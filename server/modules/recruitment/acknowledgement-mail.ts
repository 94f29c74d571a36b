import type { Contact, EligibilityResult } from '../../../shared/schemas/recruitment.js'
import type { MailDraft } from '../mail/mail.service.js'
import type { Study } from '../studies/study.entity.js'

/**
 * The acknowledgement sent after a public enquiry. It repeats none of the person's answers (mail is
 * not a safe place for health information), is kind whatever the outcome, and reminds them that a
 * study is not care.
 */
export function acknowledgementMail(study: Study, contact: Contact, result: EligibilityResult | null): MailDraft {
  const resources = study.resources.map((r) => `- ${r.title}${r.url ? `: ${r.url}` : ''}${r.text ? `\n  ${r.text}` : ''}`).join('\n')
  const lines = [`Hello ${contact.name},`, '', `Thank you for your interest in the study "${study.title}". We have received your answers.`, '']
  if (result?.helpSeeking) {
    lines.push(
      'It sounds as if you are looking for help with your own health or care. This study cannot give that help, and we are sorry we cannot do more.',
      'Please contact your own doctor, nurse or care provider. In an emergency, call your local emergency number.',
    )
    if (resources) lines.push('', 'These services may be able to help:', resources)
  } else if (result?.outcome === 'not_eligible') {
    lines.push('This time the study cannot include you. Thank you for offering your time.')
    if (resources) lines.push('', 'You may find these useful:', resources)
  } else {
    lines.push('Someone from the study team will contact you.')
  }
  lines.push('', 'This is a research study. It does not give medical advice or care.')
  return { to: contact.email, subject: `Thank you for contacting the study "${study.title}"`, body: lines.join('\n') + '\n' }
}
