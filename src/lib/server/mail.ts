import nodemailer, { type Transporter } from 'nodemailer';
import { storableErrorMessage, storableText } from '~/core/text/storable-text';
import { serverEnv } from './env';
import { getBoss, QUEUES } from './jobs/boss';

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
      // A server that does not answer must not hold a request for nodemailer's default two minutes.
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 30_000,
    });
  }
  return transport;
}

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
}

/** Hands one message to the configured SMTP server now; throws when it is not taken. */
export async function deliverMail(mail: OutgoingMail): Promise<void> {
  await getTransport().sendMail({ from: serverEnv().mailFrom, ...mail });
}

/**
 * Sends one message through the configured SMTP server (the local sink in dev and tests).
 * When the server cannot take it now, the message is queued (`send-mail`) and a worker
 * retries it with growing waits for about two and a half hours; the caller goes on either
 * way. Throws only when the message can be neither sent nor queued.
 */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  try {
    await deliverMail(mail);
  } catch (err) {
    const boss = await getBoss();
    // The job's data is jsonb, which takes no NUL.
    const queued: OutgoingMail = { to: mail.to, subject: storableText(mail.subject, 1000), text: storableText(mail.text, 200_000) };
    await boss.send(QUEUES.sendMail, queued);
    console.error(`[mail] "${mail.subject}" could not be sent now (${storableErrorMessage(err, 300)}); queued for retry`);
  }
}
