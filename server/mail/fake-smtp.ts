/**
 * A local SMTP server for development and tests: it accepts every message on 127.0.0.1 and keeps
 * it in memory, attachments decoded, so the dashboard's outbox and the tests can see what left.
 * Nothing is relayed anywhere. Plain SMTP only (RFC 5321); STARTTLS is disabled, which is why the
 * client side connects with `ignoreTLS`.
 */
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';

export interface ReceivedAttachment {
  filename: string | null;
  contentType: string;
  sizeBytes: number;
  content: Buffer;
}

export interface ReceivedMail {
  /** Envelope sender and recipients (MAIL FROM / RCPT TO), as the client gave them. */
  envelopeFrom: string | null;
  envelopeTo: string[];
  messageId: string | null;
  from: string;
  to: string;
  subject: string;
  /** The first text/plain part, decoded. */
  text: string;
  attachments: ReceivedAttachment[];
  receivedAt: Date;
  raw: Buffer;
}

export interface FakeSmtp {
  host: string;
  port: number;
  /** `smtp://127.0.0.1:PORT`, for logs. */
  url: string;
  /** Every message accepted, oldest first. */
  readonly messages: ReceivedMail[];
  close(): Promise<void>;
}

/** Caps a runaway message well above any invoice PDF; the fake only ever serves this app. */
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

export async function startFakeSmtp(options: { port?: number } = {}): Promise<FakeSmtp> {
  const messages: ReceivedMail[] = [];
  const server = new SMTPServer({
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    logger: false,
    size: MAX_MESSAGE_BYTES,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('error', callback);
      stream.on('end', () => {
        try {
          const raw = Buffer.concat(chunks);
          messages.push({
            ...parseMessage(raw),
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
            envelopeTo: session.envelope.rcptTo.map((r) => r.address),
            receivedAt: new Date(),
            raw,
          });
          callback();
        } catch (error) {
          callback(error instanceof Error ? error : new Error(String(error)));
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  const { port } = server.server.address() as AddressInfo;
  let closing: Promise<void> | undefined;
  return {
    host: '127.0.0.1',
    port,
    url: `smtp://127.0.0.1:${port}`,
    messages,
    close: () => (closing ??= new Promise<void>((resolve) => server.close(() => resolve()))),
  };
}

// ---- A small MIME reader (RFC 2045–2047): enough for what nodemailer writes, not a general parser.

interface Part {
  headers: Map<string, string>;
  body: Buffer;
}

function parseMessage(raw: Buffer): Omit<ReceivedMail, 'envelopeFrom' | 'envelopeTo' | 'receivedAt' | 'raw'> {
  const root = splitPart(raw);
  const leaves = flatten(root);
  const textPart = leaves.find((p) => mediaType(p) === 'text/plain' && !isAttachment(p));
  return {
    messageId: root.headers.get('message-id') ?? null,
    from: decodeWords(root.headers.get('from') ?? ''),
    to: decodeWords(root.headers.get('to') ?? ''),
    subject: decodeWords(root.headers.get('subject') ?? ''),
    text: textPart ? decodeBody(textPart).toString('utf8') : '',
    attachments: leaves.filter(isAttachment).map((p) => {
      const content = decodeBody(p);
      return {
        filename: filenameOf(p),
        contentType: mediaType(p),
        sizeBytes: content.length,
        content,
      };
    }),
  };
}

function splitPart(raw: Buffer): Part {
  const text = raw.toString('latin1');
  const end = text.search(/\r?\n\r?\n/);
  const head = end === -1 ? text : text.slice(0, end);
  const bodyStart = end === -1 ? text.length : end + (text.slice(end).match(/^\r?\n\r?\n/)?.[0].length ?? 0);
  const headers = new Map<string, string>();
  // Folded header lines (RFC 5322 §2.2.3) continue with whitespace.
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  return { headers, body: raw.subarray(Buffer.byteLength(text.slice(0, bodyStart), 'latin1')) };
}

function flatten(part: Part): Part[] {
  const boundary = param(part.headers.get('content-type') ?? '', 'boundary');
  if (!mediaType(part).startsWith('multipart/') || !boundary) return [part];
  const body = part.body.toString('latin1');
  const pieces = body.split(`--${boundary}`).slice(1);
  const children: Part[] = [];
  for (const piece of pieces) {
    if (piece.startsWith('--')) break;
    const trimmed = piece.replace(/^\r?\n/, '').replace(/\r?\n$/, '');
    children.push(splitPart(Buffer.from(trimmed, 'latin1')));
  }
  return children.flatMap(flatten);
}

function mediaType(part: Part): string {
  return (part.headers.get('content-type') ?? 'text/plain').split(';')[0]!.trim().toLowerCase();
}

function isAttachment(part: Part): boolean {
  const disposition = part.headers.get('content-disposition') ?? '';
  return /^attachment/i.test(disposition) || filenameOf(part) !== null;
}

function filenameOf(part: Part): string | null {
  const name =
    param(part.headers.get('content-disposition') ?? '', 'filename') ??
    param(part.headers.get('content-type') ?? '', 'name');
  return name === null ? null : decodeWords(name);
}

/** A header parameter, quoted or not; RFC 2231 `name*=utf-8''…` forms are decoded too. */
function param(header: string, name: string): string | null {
  const extended = new RegExp(`;\\s*${name}\\*=([^;]+)`, 'i').exec(header);
  if (extended) {
    const value = extended[1]!.trim().replace(/^"|"$/g, '');
    const encoded = value.includes("''") ? value.slice(value.indexOf("''") + 2) : value;
    return decodeURIComponent(encoded);
  }
  const plain = new RegExp(`;\\s*${name}=("([^"]*)"|[^;\\s]+)`, 'i').exec(header);
  if (!plain) return null;
  return plain[2] ?? plain[1]!;
}

function decodeBody(part: Part): Buffer {
  const encoding = (part.headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  if (encoding === 'base64') return Buffer.from(part.body.toString('latin1').replace(/\s+/g, ''), 'base64');
  if (encoding === 'quoted-printable') return decodeQuotedPrintable(part.body.toString('latin1'));
  return part.body;
}

/** RFC 2045 §6.7: `=XX` bytes and `=` soft line breaks. */
function decodeQuotedPrintable(text: string): Buffer {
  const joined = text.replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < joined.length; i++) {
    const hex = joined.slice(i + 1, i + 3);
    if (joined[i] === '=' && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(parseInt(hex, 16));
      i += 2;
    } else {
      bytes.push(joined.charCodeAt(i));
    }
  }
  return Buffer.from(bytes);
}

/** RFC 2047 encoded words (`=?utf-8?B?…?=`, `=?utf-8?Q?…?=`) in a header. */
function decodeWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g, (_all, _charset: string, kind: string, data: string) =>
      kind.toUpperCase() === 'B'
        ? Buffer.from(data, 'base64').toString('utf8')
        : decodeQuotedPrintable(data.replace(/_/g, ' ')).toString('utf8'),
    );
}
