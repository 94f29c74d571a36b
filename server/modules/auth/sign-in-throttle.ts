import type { Pool } from 'pg'
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible'
import { TooManyRequestsError } from '../../lib/errors.js'

export interface ThrottleSettings {
  perAccount: number
  perAddress: number
  windowMinutes: number
}

/**
 * Counts failed sign-ins per account and per client address in PostgreSQL (the `rate_limits` table),
 * so every app instance shares the same counts (express-rate-limit's memory store would not). No
 * permanent lock-out: the count expires with the window, and a successful sign-in clears the
 * account's count (NIST SP 800-63B-4 §3.2.2 allows at most 100 consecutive failures).
 */
export class SignInThrottle {
  private readonly account: RateLimiterPostgres
  private readonly address: RateLimiterPostgres

  constructor(pool: Pool, private readonly settings: ThrottleSettings) {
    const common = { storeClient: pool, tableName: 'rate_limits', tableCreated: true, duration: settings.windowMinutes * 60 }
    this.account = new RateLimiterPostgres({ ...common, keyPrefix: 'signin-account', points: settings.perAccount })
    this.address = new RateLimiterPostgres({ ...common, keyPrefix: 'signin-address', points: settings.perAddress })
  }

  /** Refuses before any password is checked when either count is used up. */
  async check(email: string, address: string): Promise<void> {
    const [byAccount, byAddress] = await Promise.all([this.account.get(email), this.address.get(address)])
    for (const [state, limit] of [
      [byAccount, this.settings.perAccount],
      [byAddress, this.settings.perAddress],
    ] as const) {
      if (state && state.consumedPoints >= limit) throw this.tooMany(state)
    }
  }

  async failed(email: string, address: string): Promise<void> {
    await Promise.all([this.account.penalty(email, 1), this.address.penalty(address, 1)])
  }

  async succeeded(email: string): Promise<void> {
    await this.account.delete(email)
  }

  private tooMany(state: RateLimiterRes): TooManyRequestsError {
    const seconds = Math.max(1, Math.ceil(state.msBeforeNext / 1000))
    const minutes = Math.ceil(seconds / 60)
    return new TooManyRequestsError(
      `Too many unsuccessful sign-ins. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again, or reset your password.`,
      seconds,
    )
  }
}
