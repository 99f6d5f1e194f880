import nodemailer, { type Transporter } from "nodemailer";
import { config } from "../config";
import { AppError } from "../errors";

export interface OutgoingMail {
  to: string[];
  subject: string;
  text: string;
  messageId?: string;
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
  try {
    const info = await transportNow().sendMail({ from: `Quartermark <${config.mailFrom}>`, ...mail });
    if (info.rejected?.length) throw new MailNotSentError(`refused: ${info.rejected.join(", ")}`, true);
    return info.messageId;
  } catch (err) {
    if (err instanceof MailNotSentError) throw err;
    const e = err as { message?: string; responseCode?: number };
    throw new MailNotSentError(
      (e.message ?? String(err)).slice(0, 200),
      typeof e.responseCode === "number" && e.responseCode >= 500,
    );
  }
}
