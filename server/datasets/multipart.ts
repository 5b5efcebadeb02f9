import "server-only";

/**
 * A streaming multipart/form-data reader (RFC 7578) for uploads: parts come one after the other, and a
 * part's body is an async iterable of Buffers read straight off the request, so a 200 MB file never
 * sits in memory (`request.formData()` would buffer all of it). Read (or skip) each part's body before
 * asking for the next part; an unread body is skipped.
 *
 * Only what uploads need: `Content-Disposition: form-data; name="…"; filename="…"` and `Content-Type`
 * per part, CRLF line breaks, no nested multipart/mixed. Malformed input throws a MultipartError.
 */

export class MultipartError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "MultipartError";
  }
}

export type MultipartPart = {
  /** The form field name. */
  name: string;
  /** The file name of a file part (path stripped), null for plain fields. */
  filename: string | null;
  contentType: string | null;
  body: AsyncIterable<Buffer>;
  /** The whole body as UTF-8 text (for small fields; refuses more than `limit` bytes). */
  text(limit?: number): Promise<string>;
};

/** The boundary of a `multipart/form-data; boundary=…` content type, or null. */
export function multipartBoundary(contentType: string | null): string | null {
  if (!contentType || !/^multipart\/form-data\b/i.test(contentType.trim())) return null;
  const match = /;\s*boundary=(?:"([^"]{1,70})"|([^\s;]{1,70}))/i.exec(contentType);
  return match ? (match[1] ?? match[2]) : null;
}

const CRLF = Buffer.from("\r\n");
const HEADER_END = Buffer.from("\r\n\r\n");
const MAX_HEADER_BYTES = 16 * 1024;
const MAX_PREAMBLE_BYTES = 64 * 1024;

/** Pulls bytes from the source into one growing buffer. */
class Puller {
  buffer: Buffer = Buffer.alloc(0);
  private done = false;
  private readonly iterator: AsyncIterator<Uint8Array>;

  constructor(source: AsyncIterable<Uint8Array>) {
    this.iterator = source[Symbol.asyncIterator]();
  }

  /** Appends the next chunk; false at the end of the source. */
  async more(): Promise<boolean> {
    if (this.done) return false;
    const { done, value } = await this.iterator.next();
    if (done) {
      this.done = true;
      return false;
    }
    if (value.byteLength > 0) {
      const chunk = Buffer.from(value.buffer, value.byteOffset, value.byteLength);
      this.buffer = this.buffer.length === 0 ? chunk : Buffer.concat([this.buffer, chunk]);
    }
    return true;
  }

  consume(n: number): Buffer {
    const head = this.buffer.subarray(0, n);
    this.buffer = this.buffer.subarray(n);
    return head;
  }

  async close(): Promise<void> {
    await this.iterator.return?.().catch(() => {});
  }
}

function parseHeaders(block: string): { name: string; filename: string | null; contentType: string | null } {
  let disposition: string | null = null;
  let contentType: string | null = null;
  for (const line of block.split("\r\n")) {
    const colon = line.indexOf(":");
    if (colon <= 0) throw new MultipartError(`A part header line is malformed: “${line.slice(0, 80)}”.`);
    const key = line.slice(0, colon).trim().toLowerCase();
    const value = line.slice(colon + 1).trim();
    if (key === "content-disposition") disposition = value;
    else if (key === "content-type") contentType = value;
  }
  if (!disposition || !/^form-data\b/i.test(disposition)) throw new MultipartError("A part has no Content-Disposition: form-data header.");
  const param = (key: string): string | null => {
    // name="value" (browsers write " CR LF as %22 %0D %0A, HTML's form-data rules) or name=token;
    // filename* (RFC 5987) is preferred when present
    const quoted = new RegExp(`;\\s*${key}="([^"]*)"`, "i").exec(disposition!);
    if (quoted) return quoted[1].replace(/%22/g, '"').replace(/%0D/gi, "\r").replace(/%0A/gi, "\n");
    const bare = new RegExp(`;\\s*${key}=([^;\\s]+)`, "i").exec(disposition!);
    return bare ? bare[1] : null;
  };
  const name = param("name");
  if (name === null) throw new MultipartError("A part has no field name.");
  let filename = param("filename");
  const extended = /;\s*filename\*=(?:UTF-8|utf-8)''([^;\s]+)/.exec(disposition);
  if (extended) {
    try {
      filename = decodeURIComponent(extended[1]);
    } catch {
      /* keep the plain filename */
    }
  }
  if (filename !== null) filename = filename.replace(/^.*[\\/]/, "");
  return { name, filename, contentType };
}

/**
 * The parts of a multipart body, in order. Each part's `body` must be read (or is skipped) before
 * the loop asks for the next part.
 */
export async function* readMultipart(source: AsyncIterable<Uint8Array>, boundary: string): AsyncGenerator<MultipartPart> {
  const pull = new Puller(source);
  const dashBoundary = Buffer.from(`--${boundary}`);
  // a delimiter inside the stream is CRLF + "--" + boundary
  const delimiter = Buffer.concat([CRLF, dashBoundary]);
  try {
    // the preamble: the body starts with --boundary (or has junk and CRLF before it)
    for (;;) {
      if (pull.buffer.length >= dashBoundary.length && pull.buffer.subarray(0, dashBoundary.length).equals(dashBoundary)) {
        pull.consume(dashBoundary.length);
        break;
      }
      const at = pull.buffer.indexOf(delimiter);
      if (at >= 0) {
        pull.consume(at + delimiter.length);
        break;
      }
      if (pull.buffer.length > MAX_PREAMBLE_BYTES) throw new MultipartError("The multipart body does not start with its boundary.");
      if (!(await pull.more())) throw new MultipartError("The multipart body ended before its first boundary.");
    }

    for (;;) {
      // after a boundary: "--" ends the body, CRLF starts a part (transport padding allowed)
      while (pull.buffer.length < 2) if (!(await pull.more())) throw new MultipartError("The multipart body ended after a boundary.");
      if (pull.buffer[0] === 0x2d && pull.buffer[1] === 0x2d) return;
      let lineEnd = pull.buffer.indexOf(CRLF);
      while (lineEnd < 0) {
        if (pull.buffer.length > 256) throw new MultipartError("A boundary line is malformed.");
        if (!(await pull.more())) throw new MultipartError("The multipart body ended after a boundary.");
        lineEnd = pull.buffer.indexOf(CRLF);
      }
      if (pull.buffer.subarray(0, lineEnd).toString("latin1").trim() !== "") throw new MultipartError("A boundary line is malformed.");
      pull.consume(lineEnd + 2);

      // headers up to the empty line (a part with no headers starts with CRLF at once)
      let headerEnd = pull.buffer.indexOf(HEADER_END);
      let emptyHeaders = pull.buffer.length >= 2 && pull.buffer[0] === 0x0d && pull.buffer[1] === 0x0a;
      while (headerEnd < 0 && !emptyHeaders) {
        if (pull.buffer.length > MAX_HEADER_BYTES) throw new MultipartError("A part's headers are too long.");
        if (!(await pull.more())) throw new MultipartError("The multipart body ended inside a part's headers.");
        headerEnd = pull.buffer.indexOf(HEADER_END);
        emptyHeaders = pull.buffer.length >= 2 && pull.buffer[0] === 0x0d && pull.buffer[1] === 0x0a;
      }
      if (emptyHeaders) throw new MultipartError("A part has no Content-Disposition: form-data header.");
      const headers = parseHeaders(pull.consume(headerEnd).toString("utf8"));
      pull.consume(HEADER_END.length);

      let finished = false;
      async function* body(): AsyncGenerator<Buffer> {
        for (;;) {
          const at = pull.buffer.indexOf(delimiter);
          if (at >= 0) {
            if (at > 0) yield pull.consume(at);
            pull.consume(delimiter.length);
            finished = true;
            return;
          }
          // everything but a possible start of the delimiter at the end is body
          const safe = pull.buffer.length - (delimiter.length - 1);
          if (safe > 0) yield pull.consume(safe);
          if (!(await pull.more())) throw new MultipartError("The multipart body ended inside a part (the upload was cut short?).");
        }
      }
      const iterable = body();
      let started = false;
      const part: MultipartPart = {
        ...headers,
        body: {
          [Symbol.asyncIterator]() {
            if (started) throw new Error("a part's body can be read once");
            started = true;
            return iterable;
          },
        },
        async text(limit = 1024 * 1024) {
          started = true;
          const pieces: Buffer[] = [];
          let size = 0;
          for await (const piece of iterable) {
            size += piece.length;
            if (size > limit) throw new MultipartError(`The form field “${headers.name}” is longer than ${limit.toLocaleString("en")} bytes.`);
            pieces.push(piece);
          }
          try {
            return new TextDecoder("utf-8", { fatal: true }).decode(Buffer.concat(pieces));
          } catch {
            throw new MultipartError(`The form field “${headers.name}” is not UTF-8 text.`);
          }
        },
      };
      yield part;
      // skip whatever the caller left unread
      if (!finished) for await (const _ of iterable) void _;
      if (!finished) throw new MultipartError("A part was not read to its end.");
    }
  } finally {
    await pull.close();
  }
}
