import { ConsentForm } from '../modules/consent/consent-form.entity.js'
import { ConsentLink } from '../modules/consent/consent-link.entity.js'
import { ConsentRecord } from '../modules/consent/consent-record.entity.js'
import { Withdrawal, WithdrawalRequest } from '../modules/consent/withdrawal.entity.js'
import { AuditEvent } from '../modules/audit/audit-event.entity.js'
import { PasswordResetToken } from '../modules/auth/password-reset-token.entity.js'
import { OutboxMessage } from '../modules/mail/outbox-message.entity.js'
import { ParticipantContact } from '../modules/recruitment/participant-contact.entity.js'
import { ParticipantEvent } from '../modules/recruitment/participant-event.entity.js'
import { Participant } from '../modules/recruitment/participant.entity.js'
import { ScreeningQuestionnaire } from '../modules/recruitment/screening-questionnaire.entity.js'
import { Screening } from '../modules/recruitment/screening.entity.js'
import { Invitation } from '../modules/studies/invitation.entity.js'
import { Membership } from '../modules/studies/membership.entity.js'
import { Study } from '../modules/studies/study.entity.js'
import { User } from '../modules/users/user.entity.js'

/** Every entity class; listed, never globbed (globs break under vitest). */
export const entities = [User, Study, Membership, Invitation, PasswordResetToken, AuditEvent, OutboxMessage, ScreeningQuestionnaire, Participant, ParticipantContact, Screening, ParticipantEvent, ConsentForm, ConsentRecord, ConsentLink, Withdrawal, WithdrawalRequest]
