import { z } from 'zod';

/** Everything the server reads from the environment, parsed once. The only reader of process.env. */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  PUBLIC_URL: z.url().optional(),
  DATABASE_URL: z.string().optional(),
  PGHOST: z.string().default('127.0.0.1'),
  PGPORT: z.coerce.number().int().min(1).max(65535).default(54329),
  PGUSER: z.string().default('skewbench'),
  PGPASSWORD: z.string().default(''),
  PGDATABASE: z.string().default('skewbench'),
  SESSION_SECRET: z.string().min(16).optional(),
  TRUST_PROXY: z.string().optional(),
  SIGN_IN_ATTEMPTS: z.coerce.number().int().positive().default(10),
  LAB_NAME: z.string().default('Kestrel Vale Microwave Circuits Lab'),
  LAB_TIMEZONE: z.string().default('Europe/Berlin'),
  DEMO_PASSWORD: z.string().min(10).default('skewbench-demo'),
  CLIENT_DIST: z.string().default('dist'),
  LOG_LEVEL: z.enum(['debug', 'info', 'warn', 'error', 'silent']).default('info'),
  UPLOADS_DIR: z.string().min(1).default('uploads'),
  PHOTO_MAX_BYTES: z.coerce.number().int().positive().default(15 * 1024 * 1024),
  PHOTO_MAX_PIXELS: z.coerce.number().int().positive().default(50_000_000),
  SMTP_URL: z.string().regex(/^smtps?:\/\//, { error: 'must start with smtp:// or smtps://' }).optional(),
  SMTP_CAPTURE_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  MAIL_FROM: z.string().min(3).default('Skewbench <skewbench@lab.test>'),
});

export interface DbConfig {
  url?: string;
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

export interface UploadsConfig {
  dir: string;
  /** Largest accepted upload, bytes. */
  maxPhotoBytes: number;
  /** Largest accepted image, width × height as its header states (against decompression bombs). */
  maxPhotoPixels: number;
}

export interface MailConfig {
  /** The lab's SMTP relay; when unset, the local capture server receives all mail instead. */
  smtpUrl: string | undefined;
  /** Port of the local capture server on 127.0.0.1 (0: any free port). */
  capturePort: number;
  from: string;
  /** True when mail goes to the local capture server (no SMTP_URL): the mail page and GET /api/mailbox work. */
  captureInUse: boolean;
}

export interface Config {
  env: 'development' | 'production' | 'test';
  host: string;
  port: number;
  publicUrl: string;
  db: DbConfig;
  sessionSecret: string;
  trustProxy: string | undefined;
  signInAttempts: number;
  lab: { name: string; timeZone: string };
  demoPassword: string;
  clientDist: string;
  logLevel: 'debug' | 'info' | 'warn' | 'error' | 'silent';
  /** Uploaded files: the folder (relative to the working directory unless absolute) and the photo limits. */
  uploads: UploadsConfig;
  mail: MailConfig;
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`Bad configuration in the environment: ${problems}`);
  }
  const e = parsed.data;
  if (!e.SESSION_SECRET && e.NODE_ENV === 'production') {
    throw new Error('SESSION_SECRET must be set (at least 16 characters) when NODE_ENV=production');
  }
  try {
    new Intl.DateTimeFormat('en', { timeZone: e.LAB_TIMEZONE });
  } catch {
    throw new Error(`LAB_TIMEZONE "${e.LAB_TIMEZONE}" is not an IANA time zone such as Europe/Berlin`);
  }
  return {
    env: e.NODE_ENV,
    host: e.HOST,
    port: e.PORT,
    publicUrl: (e.PUBLIC_URL ?? `http://${e.HOST}:${e.PORT}`).replace(/\/$/, ''),
    db: {
      url: e.DATABASE_URL,
      host: e.PGHOST,
      port: e.PGPORT,
      user: e.PGUSER,
      password: e.PGPASSWORD,
      database: e.PGDATABASE,
    },
    sessionSecret: e.SESSION_SECRET ?? 'development-only-session-secret',
    trustProxy: e.TRUST_PROXY,
    signInAttempts: e.SIGN_IN_ATTEMPTS,
    lab: { name: e.LAB_NAME, timeZone: e.LAB_TIMEZONE },
    demoPassword: e.DEMO_PASSWORD,
    clientDist: e.CLIENT_DIST,
    logLevel: e.LOG_LEVEL,
    uploads: { dir: e.UPLOADS_DIR, maxPhotoBytes: e.PHOTO_MAX_BYTES, maxPhotoPixels: e.PHOTO_MAX_PIXELS },
    mail: { smtpUrl: e.SMTP_URL, capturePort: e.SMTP_CAPTURE_PORT, from: e.MAIL_FROM, captureInUse: !e.SMTP_URL },
  };
}
