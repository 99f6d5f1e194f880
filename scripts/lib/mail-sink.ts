import { SMTPServer } from "smtp-server";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";

/**
 * A local SMTP sink for development and tests: accepts every message on 127.0.0.1 and keeps it
 * as an .eml file, so what the product sends can be read back. Like a real server, it refuses
 * recipients it cannot deliver to: any address in the reserved `.invalid` domain (RFC 2606).
 */
export async function startMailSink(port: number, dir: string): Promise<{ port: number; close: () => Promise<void> }> {
  mkdirSync(dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onRcptTo(address, _session, callback) {
      if (/\.invalid$/i.test(address.address))
        return callback(Object.assign(new Error(`No such mailbox: ${address.address}`), { responseCode: 550 }));
      callback();
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        const file = path.join(dir, `${new Date().toISOString().replace(/[:.]/g, "-")}-${session.id}.eml`);
        writeFileSync(file, Buffer.concat(chunks));
        callback();
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
