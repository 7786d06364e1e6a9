/**
 * The local fake SMTP server of development and tests: it accepts every mail on a loopback port
 * (no TLS, no AUTH) and stores it in `captured_mail`, where site admins read it in the app. It is
 * never started in production, where SMTP_HOST points at a real relay.
 */
import { SMTPServer } from 'smtp-server';
import type pg from 'pg';
import { parseMail } from './mime';

export interface CapturedMailDto {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  receivedAt: string;
}

export interface FakeSmtp {
  port: number;
  close(): Promise<void>;
}

export async function startFakeSmtp(pool: pg.Pool, options: { host?: string; port?: number } = {}): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const parsed = parseMail(raw);
        // The envelope is the truth for recipients (Bcc never appears in the headers).
        const to = session.envelope.rcptTo.map((r) => r.address);
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : parsed.from;
        pool
          .query('INSERT INTO captured_mail (from_address, to_addresses, subject, text_body, raw) VALUES ($1, $2, $3, $4, $5)', [
            from, to.length ? to : parsed.to, parsed.subject, parsed.text, raw,
          ])
          .then(() => callback(), (err: Error) => callback(err));
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host ?? '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : (options.port ?? 0);
  return { port, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

export async function listCapturedMail(pool: pg.Pool, limit: number): Promise<CapturedMailDto[]> {
  const { rows } = await pool.query<{ id: string; from_address: string; to_addresses: string[]; subject: string; text_body: string; received_at: Date }>(
    'SELECT id, from_address, to_addresses, subject, text_body, received_at FROM captured_mail ORDER BY id DESC LIMIT $1',
    [limit],
  );
  return rows.map((r) => ({ id: String(r.id), from: r.from_address, to: r.to_addresses, subject: r.subject, text: r.text_body, receivedAt: r.received_at.toISOString() }));
}
