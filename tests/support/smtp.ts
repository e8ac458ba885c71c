import { SMTPServer } from 'smtp-server';
import { simpleParser, type ParsedMail } from 'mailparser';
import net from 'node:net';

/** A real SMTP server on loopback that parses every message it receives (mailparser). */
export async function startTestSmtp(): Promise<{ port: number; url: string; messages: ParsedMail[]; close(): Promise<void> }> {
  const messages: ParsedMail[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, _session, cb) {
      simpleParser(stream).then((m) => { messages.push(m); cb(); }, (err: Error) => cb(err));
    },
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const port = (server.server.address() as net.AddressInfo).port;
  return { port, url: `smtp://127.0.0.1:${port}`, messages, close: () => new Promise((resolve) => server.close(() => resolve())) };
}

/** A loopback port with nothing listening: connections to it are refused. */
export async function closedPort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((resolve) => s.listen(0, '127.0.0.1', () => resolve()));
  const port = (s.address() as net.AddressInfo).port;
  await new Promise<void>((resolve) => s.close(() => resolve()));
  return port;
}
