// The local stand-in for the lab's mail relay: an SMTP server on 127.0.0.1 (package smtp-server) that accepts
// every message, parses it with mailparser and keeps it in the captured_mail table for the mail page.
// Used when SMTP_URL is not set. Nothing leaves the machine.
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import type { Sequelize } from 'sequelize';
import { SMTPServer } from 'smtp-server';
import { logger } from '../../lib/logger.js';

export interface MailCapture {
  host: string;
  port: number;
  close(): Promise<void>;
}

/** Largest message accepted, bytes (the SIZE extension announces it). */
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

function addressText(value: AddressObject | AddressObject[] | undefined): string {
  if (!value) return '';
  return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(', ');
}

export async function startMailCapture(sequelize: Sequelize, options: { host?: string; port: number }): Promise<MailCapture> {
  const host = options.host ?? '127.0.0.1';
  const server = new SMTPServer({
    name: 'skewbench-capture',
    banner: 'Skewbench local mail capture: messages are kept for the mail page, nothing is relayed',
    // smtp-server's built-in certificate has expired, and on loopback TLS protects nothing: plain SMTP only.
    disabledCommands: ['STARTTLS', 'AUTH'],
    authOptional: true,
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
            const err = Object.assign(new Error('Message too large'), { responseCode: 552 });
            throw err;
          }
          const mailFrom = session.envelope.mailFrom;
          await sequelize.query(
            `INSERT INTO captured_mail (envelope_from, envelope_to, from_header, to_header, subject, message_id, text_body, html_body, attachments, size_bytes)
             VALUES (:envelopeFrom, ARRAY[:envelopeTo]::text[], :fromHeader, :toHeader, :subject, :messageId, :text, :html, :attachments, :size)`,
            {
              replacements: {
                envelopeFrom: mailFrom ? mailFrom.address : '',
                envelopeTo: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
                fromHeader: addressText(parsed.from),
                toHeader: addressText(parsed.to),
                subject: parsed.subject ?? '',
                messageId: parsed.messageId ?? null,
                text: parsed.text ?? null,
                html: typeof parsed.html === 'string' ? parsed.html : null,
                attachments: JSON.stringify(
                  parsed.attachments.map((a) => ({ filename: a.filename ?? 'attachment', contentType: a.contentType, size: a.size, content: a.content.toString('base64') })),
                ),
                size: stream.byteLength ?? 0,
              },
            },
          );
        })
        .then(
          () => callback(),
          (err: Error) => {
            logger.warn(`mail capture refused a message: ${err.message}`);
            callback(err);
          },
        );
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  server.on('error', (err) => logger.warn(`mail capture: ${err.message}`));
  const { port } = server.server.address() as AddressInfo;
  return {
    host,
    port,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}
