import type { MailDraft } from '../mail/mail.service.js'

/** The e-mails partners get about a review round: plain words, one link, no study data. */
export function roundOpenedMail(to: string, name: string, studyTitle: string, title: string, closesOn: string, link: string, message: string): MailDraft {
  return {
    to,
    subject: `Themes to read for ${studyTitle}`,
    body: [
      `Hello ${name},`,
      '',
      `The research team of "${studyTitle}" would like your view on some themes: "${title}".`,
      `Please read them and tell us what you think by ${longDate(closesOn)}.`,
      ...(message ? ['', message] : []),
      '',
      `Open the themes here (you will be asked to sign in): ${link}`,
      '',
      'Thank you for your time and your experience.',
    ].join('\n'),
  }
}

export function roundReminderMail(to: string, name: string, studyTitle: string, title: string, closesOn: string, link: string): MailDraft {
  return {
    to,
    subject: `A reminder: themes to read for ${studyTitle}`,
    body: [`Hello ${name},`, '', `A friendly reminder: "${title}" closes on ${longDate(closesOn)}.`, `You can still read the themes and answer: ${link}`, '', 'Thank you.'].join('\n'),
  }
}

export function longDate(isoDate: string): string {
  return new Date(`${isoDate}T12:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' })
}
