import { defineStore } from 'pinia'
import { ref } from 'vue'
import { messageOf } from '@/api/errors'

export interface Notice {
  text: string
  color: 'success' | 'error' | 'info'
  timeout: number
}

/** The one snackbar queue of the app; App.vue shows it. */
export const useNotificationsStore = defineStore('notifications', () => {
  const queue = ref<Notice[]>([])

  function notify(text: string, color: Notice['color'] = 'info'): void {
    // Errors stay longer: people need time to read what went wrong.
    queue.value.push({ text, color, timeout: color === 'error' ? 9000 : 5000 })
  }

  const success = (text: string) => notify(text, 'success')
  const failure = (error: unknown) => notify(typeof error === 'string' ? error : messageOf(error), 'error')

  return { queue, notify, success, failure }
})
