/**
 * Outgoing mail over SMTP (nodemailer). In development and tests the scripts start a local fake
 * SMTP server (mail/captured-mail.ts) and point SMTP_HOST/SMTP_PORT at it.
 */
import nodemailer from 'nodemailer';
import type { Logger } from 'pino';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
}

export interface Mailer {
  send(message: MailMessage): Promise<void>;
}

export interface SmtpSettings {
  host: string;
  port: number;
  from: string;
  /** Plain SMTP without STARTTLS: only for a server on this machine (the fake one offers no TLS). */
  ignoreTLS: boolean;
}

export function createMailer(settings: SmtpSettings | null, logger: Logger): Mailer {
  if (!settings) {
    return {
      async send(message) {
        logger.warn({ to: message.to, subject: message.subject }, 'no SMTP server configured (SMTP_HOST); mail not sent');
      },
    };
  }
  const transport = nodemailer.createTransport({ host: settings.host, port: settings.port, secure: false, ignoreTLS: settings.ignoreTLS });
  return {
    async send(message) {
      await transport.sendMail({ from: settings.from, to: message.to, subject: message.subject, text: message.text });
    },
  };
}

export function isLoopbackHost(host: string): boolean {
  return host === 'localhost' || host === '::1' || /^127\./.test(host);
}
