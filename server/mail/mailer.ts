import nodemailer from 'nodemailer';
import type { Config } from '../config';

/** An outgoing message. */
export interface Mail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

/** Sends mail; nodemailer over SMTP (the local fake inbox in development and tests). */
export interface Mailer {
  send(mail: Mail): Promise<void>;
}

export function createMailer(config: Config): Mailer {
  const transport = nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE,
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASS ?? '' } : undefined,
    ignoreTLS: !config.SMTP_SECURE && config.SMTP_HOST === '127.0.0.1',
  });
  return {
    async send(mail) {
      await transport.sendMail({ from: config.MAIL_FROM, ...mail });
    },
  };
}
