import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

export const projectRoot = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

const envSchema = z.object({
  PORT: z.coerce.number().int().min(1).max(65535).default(4300),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z.string().url().optional(),
  TUCKLINE_DATA_DIR: z.string().default(join(projectRoot, '.data')),
  TUCKLINE_PG_PORT: z.coerce.number().int().min(1024).max(65535).default(54330),
  JWT_SECRET: z.string().min(32, { message: 'JWT_SECRET must be at least 32 characters.' }).optional(),
  SESSION_HOURS: z.coerce.number().min(1).max(24 * 90).default(24 * 7),
  MAX_UPLOAD_MB: z.coerce.number().min(1).max(4096).default(1024),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'silent']).default('info'),
  NODE_ENV: z.string().default('development'),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Tuckline <no-reply@tuckline.test>'),
  PUBLIC_URL: z.string().optional(),
});

export interface AppConfig {
  port: number;
  host: string;
  databaseUrl: string | undefined;
  dataDir: string;
  storageDir: string;
  pgPort: number;
  jwtSecret: string;
  sessionHours: number;
  maxUploadBytes: number;
  logLevel: z.infer<typeof envSchema>['LOG_LEVEL'];
  production: boolean;
  smtpUrl: string | undefined;
  mailFrom: string;
  publicUrl: string;
  webRoot: string;
}

/** Reads and validates the environment once at start-up; a bad value stops the process with a clear message. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join('.')}: ${issue.message}`);
    throw new Error(`Invalid environment:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  const dataDir = resolve(e.TUCKLINE_DATA_DIR);
  return {
    port: e.PORT,
    host: e.HOST,
    databaseUrl: e.DATABASE_URL,
    dataDir,
    storageDir: join(dataDir, 'storage'),
    pgPort: e.TUCKLINE_PG_PORT,
    jwtSecret: e.JWT_SECRET ?? loadOrCreateSecret(dataDir),
    sessionHours: e.SESSION_HOURS,
    maxUploadBytes: Math.round(e.MAX_UPLOAD_MB * 1024 * 1024),
    logLevel: e.LOG_LEVEL,
    production: e.NODE_ENV === 'production',
    smtpUrl: e.SMTP_URL,
    mailFrom: e.MAIL_FROM,
    publicUrl: e.PUBLIC_URL ?? `http://${e.HOST}:${e.PORT}`,
    webRoot: join(projectRoot, 'dist/web/browser'),
  };
}

/** The JWT secret is generated once into the data folder so sessions survive a restart. */
function loadOrCreateSecret(dataDir: string): string {
  const file = join(dataDir, 'jwt-secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dirname(file), { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  writeFileSync(file, secret + '\n', { mode: 0o600 });
  return secret;
}
