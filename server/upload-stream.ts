import "server-only";
import busboy from "busboy";
import { createHash, randomUUID, type Hash } from "node:crypto";
import { createWriteStream } from "node:fs";
import { rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { Readable, Transform, type TransformCallback } from "node:stream";
import { pipeline } from "node:stream/promises";
import type { ReadableStream as WebReadableStream } from "node:stream/web";
import { HttpError } from "./http-error";

export interface UploadOptions {
  /** Name of the one file field; other file parts are skipped. */
  readonly fileField: string;
  readonly limitBytes: number;
  readonly tooLargeMessage: string;
  /** Directory for the temporary file; os.tmpdir() by default. */
  readonly directory?: string;
  /** Compute the file's SHA-256 while it streams (`ReceivedFile.sha256`). */
  readonly sha256?: boolean;
}

export interface ReceivedFile {
  /** Temporary file holding the upload; removed by `ReceivedUpload.cleanup()`. */
  readonly path: string;
  /** The client's file name, as sent (never used as a path). */
  readonly filename: string;
  readonly mimeType: string;
  readonly bytes: number;
  /** Hex SHA-256 of the bytes written, when `UploadOptions.sha256` asked for it. */
  readonly sha256?: string;
}

export interface ReceivedUpload {
  /** Text fields; the first value wins when a name repeats. */
  readonly fields: Readonly<Record<string, string>>;
  readonly file: ReceivedFile | undefined;
  cleanup(): Promise<void>;
}

// Room for the multipart boundaries, part headers and the small text fields around the file.
const FORM_OVERHEAD_BYTES = 64 * 1024;
const MAX_FIELDS = 32;
const MAX_FIELD_BYTES = 1024;

/**
 * Streams a multipart/form-data body: the named file goes straight to a temporary file (with the
 * stream's backpressure, so at most a few chunks are in memory), text fields are collected. A body
 * whose Content-Length already exceeds the limit is refused before any of it is read; one that
 * grows past it while streaming is refused as soon as it does. The temporary file is removed on
 * every failure, and by `cleanup()` after success.
 */
export async function receiveUpload(request: Request, options: UploadOptions): Promise<ReceivedUpload> {
  const contentType = request.headers.get("content-type") ?? "";
  const notMultipart = new HttpError(422, "invalid_input", `Send the form as multipart/form-data with a ${options.fileField} field.`, {
    [options.fileField]: `Send the form as multipart/form-data with a ${options.fileField} field.`,
  });
  if (!/^multipart\/form-data\s*;/i.test(contentType) || !request.body) throw notMultipart;
  const tooLarge = new HttpError(422, "too_large", options.tooLargeMessage, { [options.fileField]: options.tooLargeMessage });
  const declaredLength = Number(request.headers.get("content-length") ?? Number.NaN);
  if (declaredLength > options.limitBytes + FORM_OVERHEAD_BYTES) throw tooLarge;

  let parser: busboy.Busboy;
  try {
    parser = busboy({
      headers: { "content-type": contentType },
      // Browsers send the file name as raw UTF-8 in the part header (WHATWG HTML's form encoding).
      defParamCharset: "utf8",
      limits: { fileSize: options.limitBytes, files: 4, fields: MAX_FIELDS, fieldSize: MAX_FIELD_BYTES, parts: MAX_FIELDS + 1 },
    });
  } catch {
    throw notMultipart; // no boundary, or not a form busboy knows
  }

  const fields: Record<string, string> = {};
  let file: ReceivedFile | undefined;
  let fileWritten: Promise<void> = Promise.resolve();
  const removeFile = async () => {
    if (file) await rm(file.path, { force: true });
  };
  // A refusal is only recorded: the parser goes on reading (and discarding) the rest of the body,
  // which the byte ceiling keeps short, so that the client is still there to read the answer.
  let refusal: HttpError | undefined;
  let writeError: Error | undefined;

  parser.on("field", (name, value, info) => {
    if (info.valueTruncated) {
      refusal ??= new HttpError(422, "invalid_input", `The ${name} field is too long.`, { [name]: "This value is too long." });
    } else if (!(name in fields)) {
      fields[name] = value;
    }
  });
  parser.on("file", (name, stream, info) => {
    if (name !== options.fileField || file) {
      stream.resume();
      return;
    }
    const target = path.join(options.directory ?? tmpdir(), `proofbay-upload-${randomUUID()}`);
    const out = createWriteStream(target, { flags: "wx", mode: 0o600 });
    file = { path: target, filename: info.filename ?? "", mimeType: info.mimeType, bytes: 0 };
    const received = file;
    let bodyCutOff = false;
    stream.once("error", () => {
      bodyCutOff = true; // busboy fails the part when the form ends inside it
    });
    stream.on("limit", () => {
      refusal ??= tooLarge;
    });
    const hash = options.sha256 ? createHash("sha256") : undefined;
    const written = hash ? pipeline(stream, new Digesting(hash), out) : pipeline(stream, out);
    fileWritten = written.then(
      () => {
        file = { ...received, bytes: out.bytesWritten, ...(hash ? { sha256: hash.digest("hex") } : {}) };
      },
      (error: Error) => {
        // The write stream failing is our disk; the part stream failing is a body cut off.
        if (bodyCutOff) refusal ??= malformed();
        else writeError ??= error;
        stream.resume();
      },
    );
  });
  parser.on("fieldsLimit", () => {
    refusal ??= tooManyFields();
  });
  parser.on("partsLimit", () => {
    refusal ??= tooManyFields();
  });

  let streamError: unknown;
  try {
    const source = Readable.fromWeb(request.body as WebReadableStream<Uint8Array>);
    await pipeline(source, new ByteCeiling(options.limitBytes + FORM_OVERHEAD_BYTES, tooLarge), parser);
  } catch (error) {
    streamError = error;
  }
  await fileWritten;
  if (streamError === undefined && refusal === undefined && writeError === undefined) {
    return { fields, file, cleanup: removeFile };
  }
  await removeFile();
  if (writeError) throw writeError; // our disk, not the client's fault: a 500
  if (streamError instanceof HttpError) throw streamError;
  if (refusal) throw refusal;
  throw malformed();
}

function malformed(): HttpError {
  return new HttpError(400, "malformed_upload", "The upload was cut off or is not valid multipart/form-data.");
}

function tooManyFields(): HttpError {
  return new HttpError(422, "invalid_input", "The form has too many fields.", { _: "The form has too many fields." });
}

/** Passes bytes through unchanged, feeding each chunk to a hash on the way. */
class Digesting extends Transform {
  constructor(private readonly hash: Hash) {
    super();
  }

  override _transform(chunk: Buffer, _encoding: BufferEncoding, callback: TransformCallback): void {
    this.hash.update(chunk);
    callback(null, chunk);
  }
}

/** Passes bytes through until more than `limit` have gone by, then fails the pipeline. */
class ByteCeiling extends Transform {
  private seen = 0;

  constructor(
    private readonly limit: number,
    private readonly error: Error,
  ) {
    super();
  }

  override _transform(chunk: Buffer, _encoding: BufferEncoding, callback: TransformCallback): void {
    this.seen += chunk.length;
    if (this.seen > this.limit) callback(this.error);
    else callback(null, chunk);
  }
}
