/** A small levelled logger writing one line per event to stderr. */
const levels = { debug: 10, info: 20, warn: 30, error: 40, silent: 100 } as const;
export type LogLevel = keyof typeof levels;

let threshold: number = levels.info;

export function setLogLevel(level: LogLevel): void {
  threshold = levels[level];
}

function write(level: Exclude<LogLevel, 'silent'>, message: string, extra?: unknown): void {
  if (levels[level] < threshold) return;
  const line = `${new Date().toISOString()} ${level.toUpperCase()} ${message}`;
  if (extra === undefined) console.error(line);
  else console.error(line, extra);
}

export const logger = {
  debug: (message: string, extra?: unknown) => write('debug', message, extra),
  info: (message: string, extra?: unknown) => write('info', message, extra),
  warn: (message: string, extra?: unknown) => write('warn', message, extra),
  error: (message: string, extra?: unknown) => write('error', message, extra),
};
