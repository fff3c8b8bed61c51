import { EventEmitter } from 'node:events';

export interface CapturedAttachment {
  filename: string;
  contentType: string;
  content: Buffer;
}

/** One message as the catcher received it. */
export interface CapturedMessage {
  id: string;
  receivedAt: Date;
  from: string;
  to: string[];
  cc: string[];
  /** RCPT TO addresses, which include Bcc recipients the headers never show. */
  envelopeTo: string[];
  subject: string;
  text: string;
  html: string | null;
  headers: Record<string, string>;
  attachments: CapturedAttachment[];
  links: string[];
  /** The message exactly as received, for a "view source" download. */
  raw: Buffer;
  size: number;
}

export interface MessageJson {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  cc: string[];
  subject: string;
  text: string;
  html: string | null;
  headers: Record<string, string>;
  attachments: { filename: string; contentType: string; size: number; index: number }[];
  links: string[];
}

export function toMessageJson(message: CapturedMessage): MessageJson {
  return {
    id: message.id,
    receivedAt: message.receivedAt.toISOString(),
    from: message.from,
    to: [...message.to],
    cc: [...message.cc],
    subject: message.subject,
    text: message.text,
    html: message.html,
    headers: { ...message.headers },
    attachments: message.attachments.map((a, index) => ({
      filename: a.filename,
      contentType: a.contentType,
      size: a.content.length,
      index,
    })),
    links: [...message.links],
  };
}

export type NewMessage = Omit<CapturedMessage, 'id' | 'receivedAt'> & { receivedAt?: Date };

const normalise = (address: string): string => address.trim().toLowerCase();

function addressedTo(message: CapturedMessage, address: string): boolean {
  const wanted = normalise(address);
  return [...message.to, ...message.cc, ...message.envelopeTo].some((a) => normalise(a) === wanted);
}

/** In-memory mailbox that keeps only the most recent messages, so a long demo session cannot grow without bound. */
export class MailStore {
  readonly capacity: number;
  private messages: CapturedMessage[] = [];
  private nextId = 1;
  private readonly events = new EventEmitter();

  constructor(options: { capacity?: number } = {}) {
    const capacity = options.capacity ?? 500;
    if (!Number.isInteger(capacity) || capacity < 1) {
      throw new RangeError(`capacity must be a whole number of at least 1, got ${String(options.capacity)}`);
    }
    this.capacity = capacity;
    this.events.setMaxListeners(0);
  }

  add(input: NewMessage): CapturedMessage {
    const message: CapturedMessage = {
      ...input,
      // Ids keep counting after a clear so a stale id never points at a different message.
      id: String(this.nextId++),
      receivedAt: input.receivedAt ?? new Date(),
    };
    this.messages.push(message);
    if (this.messages.length > this.capacity) {
      this.messages.splice(0, this.messages.length - this.capacity);
    }
    this.events.emit('message', message);
    return message;
  }

  /** Newest first; `to` matches To, Cc or envelope recipients, ignoring case. */
  list(filter: { to?: string | undefined; messageId?: string | undefined } = {}): CapturedMessage[] {
    const newestFirst = [...this.messages].reverse();
    const { to, messageId } = filter;
    return newestFirst.filter((m) => (!to || addressedTo(m, to)) && (!messageId || m.headers['message-id'] === messageId));
  }

  latest(filter: { to?: string } = {}): CapturedMessage | undefined {
    return this.list(filter)[0];
  }

  get(id: string): CapturedMessage | undefined {
    return this.messages.find((m) => m.id === id);
  }

  get size(): number {
    return this.messages.length;
  }

  clear(): void {
    this.messages = [];
  }

  /**
   * Resolves with the newest matching message, waiting up to `timeoutMs` for one to arrive.
   * Mail is sent from background jobs, so a test usually has to wait a moment for it.
   */
  waitForLatest(filter: { to?: string; after?: Date } = {}, timeoutMs = 5000): Promise<CapturedMessage | undefined> {
    const matches = (m: CapturedMessage): boolean => (!filter.to || addressedTo(m, filter.to)) && (!filter.after || m.receivedAt > filter.after);
    const existing = this.list().find(matches);
    if (existing || timeoutMs <= 0) return Promise.resolve(existing);
    return new Promise((resolve) => {
      const onMessage = (m: CapturedMessage): void => {
        if (!matches(m)) return;
        clearTimeout(timer);
        this.events.off('message', onMessage);
        resolve(m);
      };
      const timer = setTimeout(() => {
        this.events.off('message', onMessage);
        resolve(undefined);
      }, timeoutMs);
      this.events.on('message', onMessage);
    });
  }
}
