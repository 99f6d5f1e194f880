import net from "node:net";
import { describe, expect, it } from "vitest";
import { startPrivateDb } from "../../scripts/lib/mariadb";

describe("the private MariaDB launcher", () => {
  it("when its port is taken by another program, then it stops at once with a clear message instead of hanging", async () => {
    const squatter = net.createServer().listen(0, "127.0.0.1");
    await new Promise((r) => squatter.once("listening", r));
    const { port } = squatter.address() as net.AddressInfo;
    try {
      await expect(startPrivateDb(port)).rejects.toThrow(
        new RegExp(`Port ${port} on 127.0.0.1 is already in use.*DB_PORT=`, "s"),
      );
    } finally {
      squatter.close();
    }
  });
});
