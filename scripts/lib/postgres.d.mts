export function findPostgresBin(): string | null;
export function ensurePostgresInstalled(): string;
export function freePort(): Promise<number>;
export class Cluster {
  constructor(options: { base: string; port: number; password: string; throwaway?: boolean });
  readonly base: string;
  readonly port: number;
  readonly user: string;
  readonly password: string;
  init(): boolean;
  start(): void;
  stop(): void;
  isRunning(): boolean;
  connection(database: string): { host: string; port: number; user: string; password: string; database: string };
  createDatabase(database: string, options?: { template?: string }): Promise<boolean>;
}
