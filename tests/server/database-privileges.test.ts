import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../server/db/sequelize";
import { config } from "../../server/config";

/**
 * What someone who takes over the application's database account can do to the machine: the
 * account holds no FILE privilege, server-side file access is confined to an empty folder of its
 * own (secure_file_priv), and mariadbd does not run as root.
 */
describe("the database account and server are confined", () => {
  afterAll(() => sequelize.close());

  it("when the application's account asks for its grants, then FILE is not among them", async () => {
    const rows = await sequelize.query<Record<string, string>>("SHOW GRANTS", { type: QueryTypes.SELECT });
    const grants = rows.map((r) => Object.values(r)[0]);
    expect(grants.length).toBeGreaterThan(0);
    for (const grant of grants) expect(grant).not.toMatch(/\bFILE\b|ALL PRIVILEGES ON \*\.\*/);
  });

  it("when the account tries to read a file of the server's machine, then it gets nothing", async () => {
    const [row] = await sequelize.query<{ leaked: string | null }>("SELECT LOAD_FILE('/etc/passwd') AS leaked", {
      type: QueryTypes.SELECT,
    });
    expect(row.leaked).toBeNull();
    await expect(sequelize.query("SELECT 1 INTO OUTFILE '/tmp/quartermark-outfile-probe'")).rejects.toThrow(
      /denied|FILE/i,
    );
  });

  it("when the server is asked where file import and export may happen, then it names one folder, not everywhere", async () => {
    const [row] = await sequelize.query<{ priv: string | null }>("SELECT @@secure_file_priv AS priv", {
      type: QueryTypes.SELECT,
    });
    expect(row.priv).toBeTruthy();
    expect(path.resolve(row.priv!)).toBe(path.join(config.dataDir, "mariadb-run", "files"));
  });

  it("when the private server was started by root, then mariadbd runs as the mysql account wherever that account can reach the checkout", () => {
    const pidFile = path.join(config.dataDir, "mariadb-run", `mysqld-${config.db.port}.pid`);
    const pid = readFileSync(pidFile, "utf8").trim();
    const owner = execFileSync("ps", ["-o", "user=", "-p", pid], { encoding: "utf8" }).trim();
    const me = execFileSync("id", ["-un"], { encoding: "utf8" }).trim();
    const [account, why] = readFileSync(path.join(config.dataDir, "mariadb-run", "account"), "utf8").split("\n");
    expect(owner).toBe(account);
    if (me !== "root") {
      expect(owner).toBe(me);
      return;
    }
    if (owner === "root") {
      // Only allowed when the mysql account really cannot reach the checkout (e.g. under /root, 0700).
      expect(why).toMatch(/cannot enter/);
      expect(() =>
        execFileSync("runuser", ["-u", "mysql", "--", "test", "-x", config.dataDir], { stdio: "ignore" }),
      ).toThrow();
      return;
    }
    expect(owner).toBe("mysql");
  });
});
