export function findPostgresBin(): string | null
export function ensurePostgresInstalled(log?: (message: string) => void): string
export function ensureCluster(options: { bin: string; dataDir: string; port: number; fast?: boolean; log?: (message: string) => void }): Promise<{ started: boolean }>
export function stopCluster(options: { bin: string; dataDir: string }): void
export function isPortOpen(port: number, host?: string): Promise<boolean>
export function freePort(): Promise<number>
