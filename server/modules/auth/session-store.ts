import type { Pool } from 'pg'

/** Ends sessions in the PostgreSQL session table (sign out everywhere, disabled accounts, password resets). */
export class SessionRevoker {
  constructor(private readonly pool: Pool) {}

  async revokeAll(userId: string, exceptSid?: string): Promise<number> {
    const result = await this.pool.query(
      `DELETE FROM "session" WHERE sess->'passport'->>'user' = $1 AND ($2::varchar IS NULL OR sid <> $2)`,
      [userId, exceptSid ?? null],
    )
    return result.rowCount ?? 0
  }
}
