// Enough MIME to read back what nodemailer writes (RFC 2045-2047): folded headers, nested multiparts,
// base64 and quoted-printable bodies, encoded-word subjects and RFC 2231 file names.
export type MimePart = {
  contentType: string;
  filename: string | null;
  disposition: string | null;
  content: Buffer;
};
export type ParsedMessage = {
  headers: Record<string, string>;
  subject: string;
  from: string;
  to: string;
  date: string | null;
  messageId: string | null;
  text: string | null;
  html: string | null;
  attachments: MimePart[];
};

function splitHead(raw: Buffer): { head: string; body: Buffer } {
  const text = raw.toString('latin1');
  let idx = text.indexOf('\r\n\r\n');
  let sep = 4;
  if (idx < 0) {
    idx = text.indexOf('\n\n');
    sep = 2;
  }
  if (idx < 0) return { head: text, body: Buffer.alloc(0) };
  return { head: text.slice(0, idx), body: raw.subarray(idx + sep) };
}

function parseHeaders(head: string): Record<string, string> {
  const headers: Record<string, string> = {};
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon <= 0) continue;
    headers[line.slice(0, colon).trim().toLowerCase()] = line.slice(colon + 1).trim();
  }
  return headers;
}

function param(value: string, name: string): string | null {
  const extended = new RegExp(`${name}\\*=(?:[^']*)'[^']*'([^;]+)`, 'i').exec(value);
  if (extended) return decodeURIComponent(extended[1].trim());
  const plain = new RegExp(`${name}="?([^";]+)"?`, 'i').exec(value);
  return plain ? decodeWords(plain[1].trim()) : null;
}

function decodeQuotedPrintable(body: Buffer): Buffer {
  const text = body.toString('latin1').replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < text.length; i++) {
    if (text[i] === '=' && /^[0-9A-Fa-f]{2}$/.test(text.slice(i + 1, i + 3))) {
      bytes.push(parseInt(text.slice(i + 1, i + 3), 16));
      i += 2;
    } else bytes.push(text.charCodeAt(i));
  }
  return Buffer.from(bytes);
}

export function decodeWords(value: string): string {
  return value.replace(
    /=\?([^?]+)\?([BbQq])\?([^?]*)\?=\s*(?==\?)|=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g,
    (...m: string[]) => {
      const enc = m[2] || m[5];
      const data = m[3] ?? m[6];
      const bytes =
        enc.toUpperCase() === 'B'
          ? Buffer.from(data, 'base64')
          : decodeQuotedPrintable(Buffer.from(data.replace(/_/g, ' '), 'latin1'));
      return bytes.toString('utf8');
    },
  );
}

function decodeBody(body: Buffer, encoding: string | undefined): Buffer {
  const e = (encoding ?? '7bit').toLowerCase();
  if (e === 'base64') return Buffer.from(body.toString('latin1').replace(/\s+/g, ''), 'base64');
  if (e === 'quoted-printable') return decodeQuotedPrintable(body);
  return body;
}

function leaves(raw: Buffer): { headers: Record<string, string>; content: Buffer }[] {
  const { head, body } = splitHead(raw);
  const headers = parseHeaders(head);
  const type = headers['content-type'] ?? 'text/plain';
  const boundary = /^multipart\//i.test(type) ? param(type, 'boundary') : null;
  if (!boundary) return [{ headers, content: decodeBody(body, headers['content-transfer-encoding']) }];
  const text = body.toString('latin1');
  const marker = `--${boundary}`;
  const out: { headers: Record<string, string>; content: Buffer }[] = [];
  const pieces = text.split(marker).slice(1);
  for (const piece of pieces) {
    if (piece.startsWith('--')) break;
    const trimmed = piece.replace(/^\r?\n/, '').replace(/\r?\n$/, '');
    out.push(...leaves(Buffer.from(trimmed, 'latin1')));
  }
  return out;
}

export function parseMessage(raw: Buffer): ParsedMessage {
  const { head } = splitHead(raw);
  const headers = parseHeaders(head);
  let text: string | null = null;
  let html: string | null = null;
  const attachments: MimePart[] = [];
  for (const leaf of leaves(raw)) {
    const contentType = (leaf.headers['content-type'] ?? 'text/plain').split(';')[0].trim().toLowerCase();
    const disposition = leaf.headers['content-disposition'] ?? null;
    const filename =
      (disposition && param(disposition, 'filename')) || param(leaf.headers['content-type'] ?? '', 'name');
    const isAttachment = Boolean(filename) || /^attachment/i.test(disposition ?? '');
    if (!isAttachment && contentType === 'text/plain' && text === null) text = leaf.content.toString('utf8');
    else if (!isAttachment && contentType === 'text/html' && html === null)
      html = leaf.content.toString('utf8');
    else
      attachments.push({
        contentType,
        filename: filename ?? null,
        disposition: disposition?.split(';')[0] ?? null,
        content: leaf.content,
      });
  }
  return {
    headers,
    subject: decodeWords(headers.subject ?? ''),
    from: decodeWords(headers.from ?? ''),
    to: decodeWords(headers.to ?? ''),
    date: headers.date ?? null,
    messageId: headers['message-id'] ?? null,
    text,
    html,
    attachments,
  };
}
