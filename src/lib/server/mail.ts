import nodemailer, { type Transporter } from 'nodemailer';
import { serverEnv } from './env';

let transport: Transporter | undefined;

function getTransport(): Transporter {
  if (!transport) {
    const { smtp } = serverEnv();
    transport = nodemailer.createTransport({
      host: smtp.host,
      port: smtp.port,
      secure: smtp.secure,
      auth: smtp.user ? { user: smtp.user, pass: smtp.password ?? '' } : undefined,
      // The local sink speaks plain SMTP on loopback.
      ignoreTLS: !smtp.secure && (smtp.host === '127.0.0.1' || smtp.host === 'localhost'),
    });
  }
  return transport;
}

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
}

/** Sends one message through the configured SMTP server (the local sink in dev and tests). */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  await getTransport().sendMail({ from: serverEnv().mailFrom, ...mail });
}
