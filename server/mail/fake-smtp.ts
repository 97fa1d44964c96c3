import type { AddressInfo } from 'node:net';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export interface CaughtMessage {
  id: number;
  to: string[];
  from: string;
  subject: string;
  text: string;
  html: string;
  receivedAt: string;
}

/**
 * A local SMTP server that accepts every message on loopback and keeps it in
 * memory (the newest 200), so development and tests can read what was sent.
 * It speaks real SMTP: the app talks to it through nodemailer as to any server.
 */
export async function startFakeSmtp(port = 0): Promise<{ url: string; port: number; messages(): CaughtMessage[]; waitFor(to: string, timeoutMs?: number): Promise<CaughtMessage>; stop(): Promise<void> }> {
  const caught: CaughtMessage[] = [];
  const waiters: { to: string; resolve: (m: CaughtMessage) => void }[] = [];
  let next = 1;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 5 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const message: CaughtMessage = {
            id: next++,
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : '',
            receivedAt: new Date().toISOString(),
          };
          caught.push(message);
          if (caught.length > 200) caught.shift();
          for (const w of [...waiters]) {
            if (message.to.includes(w.to)) {
              waiters.splice(waiters.indexOf(w), 1);
              w.resolve(message);
            }
          }
          callback();
        })
        .catch(callback);
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const actual = (server.server.address() as AddressInfo).port;
  return {
    url: `smtp://127.0.0.1:${actual}`,
    port: actual,
    messages: () => [...caught],
    /** Resolves with the next message to `to` (or the newest already caught since the call). */
    waitFor(to: string, timeoutMs = 10_000) {
      return new Promise<CaughtMessage>((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error(`No message to ${to} within ${timeoutMs} ms`)), timeoutMs);
        waiters.push({
          to: to.toLowerCase(),
          resolve: (m) => {
            clearTimeout(timer);
            resolve(m);
          },
        });
      });
    },
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
export type FakeSmtp = Awaited<ReturnType<typeof startFakeSmtp>>;
