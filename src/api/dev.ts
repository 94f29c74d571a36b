import { useQuery } from '@pinia/colada'
import { devMailboxResponse } from '@shared/schemas/dev'
import { http } from './http'

/** The local development mailbox (the fake SMTP server's messages); absent in production. */
export function useDevMailboxQuery() {
  return useQuery({ key: ['dev', 'mailbox'], query: async () => (await http.get('/dev/mailbox', devMailboxResponse)).messages })
}
