// The local fake SMTP server for dev and tests: accepts every message on loopback and keeps
// it as JSON in SLUICE_MAIL_SINK_DIR, where the dev mail page and the tests read it.
import fs from 'node:fs';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

const dir = process.env.SLUICE_MAIL_SINK_DIR ?? '.data/mail';
const port = Number(process.env.SMTP_PORT ?? 2525);
fs.mkdirSync(dir, { recursive: true });

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  banner: 'Sluice local mail sink',
  size: 5 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        const record = {
          receivedAt: new Date().toISOString(),
          from: mail.from?.text ?? '',
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: mail.subject ?? '',
          text: mail.text ?? '',
        };
        const name = `${Date.now()}-${Math.random().toString(36).slice(2, 8)}.json`;
        fs.writeFileSync(path.join(dir, name), JSON.stringify(record, null, 2));
        callback();
      })
      .catch((err: Error) => callback(err));
  },
});
server.listen(port, '127.0.0.1', () => console.log(`mail sink listening on 127.0.0.1:${port}, keeping mail in ${dir}`));
