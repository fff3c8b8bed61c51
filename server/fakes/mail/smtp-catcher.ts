import type { AddressInfo } from 'node:net';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import { simpleParser, type AddressObject, type HeaderLines, type ParsedMail } from 'mailparser';
import { MailStore, type NewMessage } from './mail-store';
import { extractLinks } from './links';

export interface SmtpCatcherOptions {
  port: number;
  host?: string;
  /** Shared store; a fresh one holding the last 500 messages when omitted. */
  store?: MailStore;
  /** Largest accepted message in bytes (SMTP SIZE). */
  sizeLimit?: number;
}

export interface SmtpCatcher {
  port: number;
  host: string;
  store: MailStore;
  close(): Promise<void>;
}

const DEFAULT_SIZE_LIMIT = 10 * 1024 * 1024;

class SmtpReplyError extends Error {
  constructor(
    message: string,
    readonly responseCode: number,
  ) {
    super(message);
  }
}

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  if (!field) return [];
  const out: string[] = [];
  const walk = (entries: AddressObject['value']): void => {
    for (const entry of entries) {
      if (entry.address) out.push(entry.address);
      if (entry.group) walk(entry.group);
    }
  };
  for (const obj of Array.isArray(field) ? field : [field]) walk(obj.value);
  return out;
}

/** One string per header name; repeated headers (Received, say) are joined in order. */
function flattenHeaders(lines: HeaderLines, parsed: ParsedMail['headers']): Record<string, string> {
  const out: Record<string, string> = {};
  for (const { key, line } of lines) {
    const name = key.toLowerCase();
    const unfolded = line.replace(/\r?\n(?=[ \t])/g, '');
    const colon = unfolded.indexOf(':');
    let value = (colon >= 0 ? unfolded.slice(colon + 1) : unfolded).trim();
    // A plain-string parsed value has its encoded words (=?utf-8?...?=) decoded already.
    const decoded = parsed.get(name);
    if (typeof decoded === 'string' && lines.filter((l) => l.key.toLowerCase() === name).length === 1) {
      value = decoded;
    }
    out[name] = name in out ? `${out[name]}, ${value}` : value;
  }
  return out;
}

async function readLimited(stream: SMTPServerDataStream, limit: number): Promise<{ raw: Buffer; size: number }> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of stream as AsyncIterable<Buffer>) {
    size += chunk.length;
    // Keep draining an oversized message so the client still gets a clean 552 reply.
    if (size <= limit) chunks.push(chunk);
  }
  if (stream.sizeExceeded || size > limit) {
    throw new SmtpReplyError(`Message exceeds the ${limit} byte limit`, 552);
  }
  return { raw: Buffer.concat(chunks), size };
}

async function toNewMessage(raw: Buffer, size: number, session: SMTPServerSession): Promise<NewMessage> {
  const parsed = await simpleParser(raw, { skipImageLinks: true });
  const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
  const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
  const html = typeof parsed.html === 'string' ? parsed.html : null;
  const text = parsed.text ?? '';
  const to = addresses(parsed.to);
  return {
    from: parsed.from?.text ?? envelopeFrom,
    to: to.length > 0 ? to : envelopeTo,
    cc: addresses(parsed.cc),
    envelopeTo,
    subject: parsed.subject ?? '',
    text,
    html,
    headers: flattenHeaders(parsed.headerLines, parsed.headers),
    attachments: parsed.attachments.map((a, i) => ({
      filename: a.filename ?? `attachment-${i + 1}`,
      contentType: a.contentType,
      content: a.content,
    })),
    links: extractLinks(text, html),
    raw,
    size,
  };
}

/** Local SMTP server that accepts any mail on loopback and keeps it for the mailbox page and tests. */
export function startSmtpCatcher(options: SmtpCatcherOptions): Promise<SmtpCatcher> {
  const { port, host = '127.0.0.1', sizeLimit = DEFAULT_SIZE_LIMIT } = options;
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    return Promise.reject(new RangeError(`port must be a whole number from 0 to 65535, got ${String(port)}`));
  }
  if (!Number.isInteger(sizeLimit) || sizeLimit < 1) {
    return Promise.reject(new RangeError(`sizeLimit must be a positive whole number of bytes, got ${String(sizeLimit)}`));
  }
  const store = options.store ?? new MailStore();

  const server = new SMTPServer({
    name: 'seasonwell-catcher.localhost',
    banner: 'Seasonwell test mail catcher',
    // The built-in STARTTLS certificate has expired; plain SMTP on loopback is enough here.
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    // Accept any credentials so a provider-style smtp://user:pass@ URL works against the catcher too.
    allowInsecureAuth: true,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username ?? 'any' });
    },
    size: sizeLimit,
    logger: false,
    // No DNS on a loopback catcher; a reverse lookup only slows every connection down offline.
    disableReverseLookup: true,
    closeTimeout: 2000,
    onData(stream, session, callback) {
      readLimited(stream, sizeLimit)
        .then(({ raw, size }) => toNewMessage(raw, size, session))
        .then((message) => {
          store.add(message);
          callback();
        })
        .catch((err: unknown) => {
          if (err instanceof SmtpReplyError) {
            callback(err);
          } else {
            const failure = new SmtpReplyError(`Message could not be parsed: ${(err as Error).message}`, 451);
            callback(failure);
          }
        });
    },
  });

  return new Promise((resolve, reject) => {
    const onError = (err: Error): void => reject(new Error(`SMTP catcher could not listen on ${host}:${port}: ${err.message}`));
    server.once('error', onError);
    server.listen(port, host, () => {
      server.off('error', onError);
      // Errors after start-up (a client dropping mid-message) must not crash the process.
      server.on('error', () => {});
      const address = server.server.address() as AddressInfo;
      resolve({
        port: address.port,
        host,
        store,
        close: () => new Promise<void>((done) => server.close(() => done())),
      });
    });
  });
}
