// Types for services.mjs (plain Node so it runs before dependencies are installed).
export const projectRoot: string
export function say(message: string): void
export class SetupError extends Error {}
export function ensureNodeModules(): void
export function ensurePostgres(): string
export function ensureChromium(): string
export function assertPortFree(port: number, what: string): Promise<void>
export function ownSecretFile(path: string, bytes?: number): string
export class LocalPostgres {
  constructor(options: { bin: string; dir: string; port: number })
  readonly port: number
  readonly bin: string
  readonly socketDir: string
  readonly passwordFile: string
  password(): string
  url(database: string): string
  start(): Promise<boolean>
  stop(): void
  createDatabase(name: string): Promise<void>
}
