/**
 * The local stand-in for an e-mail provider: a real SMTP server on loopback that parses each
 * message with mailparser and stores it in PostgreSQL, where the admin's mail page reads it.
 */
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { MailMessage } from '../db/models';

const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

function addressText(value: AddressObject | AddressObject[] | undefined): string {
  if (!value) return '';
  return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(', ');
}

export interface MailSink {
  port: number;
  close(): Promise<void>;
}

export async function startMailSink({ port, host = '127.0.0.1' }: { port: number; host?: string }): Promise<MailSink> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Driftproof local mail sink',
    size: MAX_MESSAGE_BYTES,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('error', callback);
      stream.on('end', async () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          callback(Object.assign(new Error('Message too large'), { responseCode: 552 }));
          return;
        }
        try {
          const raw = Buffer.concat(chunks);
          const parsed = await simpleParser(raw);
          await MailMessage.create({
            messageId: parsed.messageId ?? null,
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            envelopeTo: session.envelope.rcptTo.map((r) => r.address).join(', '),
            fromHeader: addressText(parsed.from),
            toHeader: addressText(parsed.to),
            subject: parsed.subject ?? '(no subject)',
            textBody: parsed.text ?? null,
            htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
            sizeBytes: raw.length,
          });
          callback();
        } catch (error) {
          callback(error as Error);
        }
      });
    },
  });
  server.on('error', (error) => console.error('mail sink:', error.message));
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return {
    port: address.port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
