import { Column, Entity, JoinColumn, OneToOne, PrimaryColumn, type Relation } from 'typeorm'
import { Participant } from './participant.entity.js'

/** Identifying contact details, kept apart from the pseudonymous record (lead and coordinators only). */
@Entity('participant_contacts')
export class ParticipantContact {
  @PrimaryColumn({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'varchar', length: 120 })
  name: string

  @Column({ type: 'varchar', length: 254, default: '' })
  email: string

  @Column({ type: 'varchar', length: 40, default: '' })
  phone: string

  @Column({ type: 'varchar', length: 80, default: '' })
  country: string

  @Column({ type: 'varchar', length: 60, name: 'time_zone', default: '' })
  timeZone: string

  @Column({ type: 'boolean', name: 'consent_to_contact', default: false })
  consentToContact: boolean

  @OneToOne(() => Participant, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'participant_id' })
  participant: Relation<Participant>
}
