import { SMTPServer } from "smtp-server";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";

export interface MailSinkOptions {
  /** Refuses a recipient at RCPT TO with this 5xx text (null: accept). Default: the reserved `.invalid` domain. */
  refuse?: (address: string) => string | null;
  /** Called once a whole message is in, before the server answers 250 (tests use it to fault what follows). */
  beforeAccept?: (recipients: string[]) => Promise<void>;
}

const refuseInvalidDomain = (address: string) => (/\.invalid$/i.test(address) ? `No such mailbox: ${address}` : null);

/**
 * A local SMTP sink for development and tests: accepts every message on 127.0.0.1 and keeps it
 * as an .eml file, so what the product sends can be read back. Like a real server, it refuses
 * recipients it cannot deliver to: any address in the reserved `.invalid` domain (RFC 2606). Like
 * a real mail server delivering to a mailbox, it adds a `Delivered-To:` line per envelope recipient,
 * so that what each recipient received can be counted even when the To: header names several.
 */
export async function startMailSink(
  port: number,
  dir: string,
  options: MailSinkOptions = {},
): Promise<{ port: number; close: () => Promise<void> }> {
  mkdirSync(dir, { recursive: true });
  const refuse = options.refuse ?? refuseInvalidDomain;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onRcptTo(address, _session, callback) {
      const reason = refuse(address.address);
      if (reason) return callback(Object.assign(new Error(reason), { responseCode: 550 }));
      callback();
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        const recipients = session.envelope.rcptTo.map((r) => r.address);
        const keep = () => {
          const file = path.join(dir, `${new Date().toISOString().replace(/[:.]/g, "-")}-${session.id}.eml`);
          const delivered = recipients.map((r) => `Delivered-To: ${r}\r\n`).join("");
          writeFileSync(file, Buffer.concat([Buffer.from(delivered), ...chunks]));
          callback();
        };
        if (!options.beforeAccept) return keep();
        options.beforeAccept(recipients).then(keep, (err: Error) => callback(err));
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", (err: NodeJS.ErrnoException) =>
      reject(
        err.code === "EADDRINUSE"
          ? new Error(`SMTP port ${port} on 127.0.0.1 is in use; set SMTP_PORT to a free port.`)
          : err,
      ),
    );
    server.listen(port, "127.0.0.1", () => resolve());
  });
  const address = server.server.address();
  return {
    port: typeof address === "object" && address ? address.port : port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
