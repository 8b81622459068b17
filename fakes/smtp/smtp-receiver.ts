import { simpleParser } from "mailparser";
import { SMTPServer, type SMTPServerDataStream, type SMTPServerError, type SMTPServerSession } from "smtp-server";
import type { NewMessage } from "./message-store";
import { toNewMessage } from "./parsed-mail";

export interface SmtpReceiverOptions {
  maxMessageBytes: number;
  onMessage: (message: NewMessage) => void;
  onError: (error: Error) => void;
}

export function createSmtpReceiver(options: SmtpReceiverOptions): SMTPServer {
  const server = new SMTPServer({
    name: "proofbay-fake-inbox",
    banner: "Proofbay fake inbox, nothing leaves this machine",
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    size: options.maxMessageBytes,
    disableReverseLookup: true,
    logger: false,
    // Idle pooled clients would otherwise hold close() open for the 30 s default.
    closeTimeout: 1_000,
    // Passed on to net.createServer: answer each command at once instead of waiting on delayed ACKs.
    ...({ noDelay: true } as object),
    onData(stream, session, callback) {
      receive(stream, session).then(
        (message) => {
          options.onMessage(message);
          callback();
        },
        (error: unknown) => callback(error instanceof Error ? error : new Error(String(error))),
      );
    },
  });
  // smtp-server also emits client socket errors here; without a listener they would crash the process.
  server.on("error", options.onError);
  return server;
}

async function receive(stream: SMTPServerDataStream, session: SMTPServerSession): Promise<NewMessage> {
  const chunks: Buffer[] = [];
  for await (const chunk of stream) {
    // Keep draining an oversized message so the client gets a proper reply, but stop buffering it.
    if (!stream.sizeExceeded) chunks.push(chunk as Buffer);
  }
  if (stream.sizeExceeded) throw smtpError(552, "Message exceeds the fake inbox size limit");

  let parsed;
  try {
    parsed = await simpleParser(Buffer.concat(chunks), { skipTextToHtml: true });
  } catch (error) {
    throw smtpError(451, `Could not parse message: ${error instanceof Error ? error.message : String(error)}`);
  }
  const { mailFrom, rcptTo } = session.envelope;
  return toNewMessage(parsed, {
    from: mailFrom ? mailFrom.address || null : null,
    to: rcptTo.map((recipient) => recipient.address),
  });
}

function smtpError(responseCode: number, message: string): SMTPServerError {
  return Object.assign(new Error(message), { responseCode });
}
