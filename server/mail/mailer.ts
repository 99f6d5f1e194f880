import nodemailer, { type Transporter } from "nodemailer";
import { config } from "../config";
import { AppError } from "../errors";

export interface OutgoingMail {
  to: string[];
  subject: string;
  text: string;
  messageId?: string;
  /** Who the SMTP server delivers to, when not everyone in `to` (one recipient at a time, same message). */
  envelope?: { to: string[] };
  attachments: { filename: string; content: Buffer; contentType: string }[];
}

/**
 * The mail server did not take the message. `permanent`: it refused it (a 5xx answer such as an
 * unknown recipient), and trying again will not help; otherwise it did not answer or asked to try
 * later, and the message can wait and be sent again.
 */
export class MailNotSentError extends AppError {
  constructor(
    readonly reason: string,
    readonly permanent: boolean,
    /** The connection broke after the message was handed over and before the server answered: it may have arrived. */
    readonly maybeDelivered = false,
  ) {
    super(
      502,
      "mail_not_sent",
      permanent
        ? `The mail server refused the message (${reason}). Nothing was sent; check the supervisor contacts under Admin › Entities and file again.`
        : `The mail server did not take the message (${reason}).`,
    );
  }
}

let port = config.smtpPort;
let transport: Transporter | undefined;

// Short timeouts: a delivery holds its filing locked while the message is handed over, so a mail
// server that does not answer must fail in seconds, not minutes (nodemailer's defaults).
function transportNow(): Transporter {
  transport ??= nodemailer.createTransport({
    host: "127.0.0.1",
    port,
    secure: false,
    ignoreTLS: true,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 20_000,
  });
  return transport;
}

/** Points the mailer at another SMTP port (the tests' second sink, to see a server go down and come back). */
export function useSmtpPort(next: number): void {
  port = next;
  transport?.close();
  transport = undefined;
}

/** Sends one message over SMTP (in development and tests, the local sink) and returns its Message-ID. */
export async function sendMail(mail: OutgoingMail): Promise<string> {
  return (await handOver(mail)).messageId;
}

// Failures that happen before any message can have gone over: no server, or one that never greeted us.
const NEVER_CONNECTED = /ECONNREFUSED|EHOSTUNREACH|ENETUNREACH|ENOTFOUND|EAI_AGAIN|Greeting never received/;

/**
 * Hands one message to the SMTP server and returns its Message-ID and the server's answer (the
 * "250 …" line). A refusal or failure throws MailNotSentError with the server's own words; when
 * the connection broke after the message went over and before the answer, `maybeDelivered` says so.
 */
export async function handOver(mail: OutgoingMail): Promise<{ messageId: string; response: string }> {
  try {
    const info = await transportNow().sendMail({ from: `Quartermark <${config.mailFrom}>`, ...mail });
    if (info.rejected?.length) throw new MailNotSentError(`refused: ${info.rejected.join(", ")}`, true);
    return { messageId: info.messageId, response: String(info.response ?? "").slice(0, 300) };
  } catch (err) {
    if (err instanceof MailNotSentError) throw err;
    const e = err as { message?: string; response?: string; responseCode?: number; originalCode?: string };
    const answered = typeof e.responseCode === "number";
    const reason = (answered && e.response ? e.response : (e.message ?? String(err))).slice(0, 200);
    // The server answered with a refusal, or was never reached: nothing arrived. Otherwise the
    // connection broke somewhere in the conversation, perhaps after the message went over.
    const nothingArrived = answered || NEVER_CONNECTED.test(`${e.originalCode ?? ""} ${e.message ?? ""}`);
    throw new MailNotSentError(reason, answered && e.responseCode! >= 500, !nothingArrived);
  }
}
