// Mail for one server process: the transport (the lab's relay from SMTP_URL, or the local capture server) and
// the outbox worker that feeds it.
import nodemailer, { type Transporter } from 'nodemailer';
import type { Sequelize } from 'sequelize';
import type { MailConfig } from '../../config.js';
import { startOutboxWorker, type OutboxWorker } from './outbox.worker.js';
import { startMailCapture, type MailCapture } from './smtp-capture.js';

export interface MailRuntime {
  /** Where mail goes, for the start-up banner (credentials removed). */
  describe: string;
  capture: MailCapture | null;
  worker: OutboxWorker;
  stop(): Promise<void>;
}

/** SMTP_URL without its password, for logs. */
export function redactSmtpUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return 'smtp://(unparseable SMTP_URL)';
  }
}

export async function startMail(sequelize: Sequelize, mail: MailConfig, publicUrl: string, options: { pollMs?: number } = {}): Promise<MailRuntime> {
  let capture: MailCapture | null = null;
  let transport: Transporter;
  let describe: string;
  if (mail.smtpUrl) {
    // Time-outs, so a relay that stops answering cannot hold an outbox row's lock for nodemailer's default minutes;
    // the URL's own settings (port, TLS, credentials, ?options) win.
    transport = nodemailer.createTransport({ url: mail.smtpUrl, connectionTimeout: 15_000, greetingTimeout: 15_000, socketTimeout: 60_000 });
    describe = `sent through ${redactSmtpUrl(mail.smtpUrl)}`;
  } else {
    capture = await startMailCapture(sequelize, { port: mail.capturePort });
    // Plain SMTP on loopback (see smtp-capture.ts); short time-outs so a stopped capture is noticed quickly.
    transport = nodemailer.createTransport({ host: capture.host, port: capture.port, secure: false, ignoreTLS: true, connectionTimeout: 5000, greetingTimeout: 5000, socketTimeout: 10000 });
    describe = `captured locally on smtp://${capture.host}:${capture.port} and shown on the Mail page (set SMTP_URL to send through the lab's relay)`;
  }
  const worker = startOutboxWorker({ sequelize, transport, from: mail.from, messageIdHost: new URL(publicUrl).hostname || 'skewbench', pollMs: options.pollMs });
  return {
    describe,
    capture,
    worker,
    async stop() {
      await worker.stop();
      transport.close();
      await capture?.close();
    },
  };
}
