/**
 * The app in a process of its own, so a test can run it with another environment (NODE_ENV,
 * MAIL_SINK_DIR) than its own: listens on a free loopback port and prints `{"port":N}`.
 */
import type { AddressInfo } from "node:net";
import { createApp } from "../../../server/app";

const server = createApp().listen(0, "127.0.0.1", () => {
  console.log(JSON.stringify({ port: (server.address() as AddressInfo).port }));
});
process.on("SIGTERM", () => server.close(() => process.exit(0)));
