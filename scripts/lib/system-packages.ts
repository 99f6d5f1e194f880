import { execFileSync, spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

/** A Debian package the project needs, and the file whose presence says it is installed. */
export interface SystemPackage {
  name: string;
  provides: string[];
  why: string;
}

export const MARIADB: SystemPackage = {
  name: "mariadb-server",
  provides: ["/usr/sbin/mariadbd", "/usr/bin/mariadb-install-db"],
  why: "the database",
};
export const CHROMIUM: SystemPackage = { name: "chromium", provides: ["/usr/bin/chromium"], why: "browser tests" };
export const POPPLER: SystemPackage = {
  name: "poppler-utils",
  provides: ["/usr/bin/pdftotext", "/usr/bin/pdftoppm"],
  why: "reading generated PDF packs back in tests",
};

function isInstalled(pkg: SystemPackage): boolean {
  return pkg.provides.every((f) => existsSync(f));
}

let aptUpdated = false;

/**
 * Installs the missing Debian packages when running as root; otherwise stops with the one
 * apt command a person needs to run.
 */
export function ensureSystemPackages(pkgs: SystemPackage[]): void {
  const missing = pkgs.filter((p) => !isInstalled(p));
  if (missing.length === 0) return;
  const names = missing.map((p) => p.name).join(" ");
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (!isRoot) {
    const why = missing.map((p) => `${p.name} (${p.why})`).join(", ");
    throw new Error(`Missing system packages: ${why}.\nInstall them with:\n  sudo apt-get install -y ${names}`);
  }
  console.log(`[setup] installing ${names} from Debian's packages…`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  if (!aptUpdated) {
    execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit", env });
    aptUpdated = true;
  }
  const res = spawnSync("apt-get", ["install", "-y", "-qq", "--no-install-recommends", ...missing.map((p) => p.name)], {
    stdio: "inherit",
    env,
  });
  if (res.status !== 0) throw new Error(`apt-get install ${names} failed (exit ${res.status})`);
  const still = missing.filter((p) => !isInstalled(p));
  if (still.length)
    throw new Error(`Installed ${names}, but ${still.map((p) => p.provides.join(", ")).join("; ")} still missing`);
}
