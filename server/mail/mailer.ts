import nodemailer from "nodemailer";
import { config } from "../config";
import { AppError } from "../errors";

export interface OutgoingMail {
  to: string[];
  subject: string;
  text: string;
  attachments: { filename: string; content: Buffer; contentType: string }[];
}

/** Cannot hand the message to the mail server: nothing was sent. */
export class MailNotSentError extends AppError {
  constructor(reason: string) {
    super(502, "mail_not_sent", `The e-mail could not be handed to the mail server (${reason}). Nothing was sent and nothing was recorded; try again.`);
  }
}

// Short timeouts: a filing holds its snapshot locked while the message is handed over, so a mail
// server that does not answer must fail the filing in seconds, not minutes (nodemailer's defaults).
const transport = nodemailer.createTransport({
  host: "127.0.0.1",
  port: config.smtpPort,
  secure: false,
  ignoreTLS: true,
  connectionTimeout: 5_000,
  greetingTimeout: 5_000,
  socketTimeout: 20_000,
});

/** Sends one message over SMTP (in development and tests, the local sink) and returns its Message-ID. */
export async function sendMail(mail: OutgoingMail): Promise<string> {
  try {
    const info = await transport.sendMail({ from: `Quartermark <${config.mailFrom}>`, ...mail });
    if (info.rejected.length) throw new MailNotSentError(`refused: ${info.rejected.join(", ")}`);
    return info.messageId;
  } catch (err) {
    if (err instanceof MailNotSentError) throw err;
    throw new MailNotSentError((err as Error).message.slice(0, 200));
  }
}
