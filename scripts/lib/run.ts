import { spawn } from "node:child_process";
import path from "node:path";

export const projectRoot = path.resolve(import.meta.dirname, "..", "..");

/** Runs a project binary (node_modules/.bin) in the foreground and resolves with its exit code. */
export function runBin(bin: string, args: string[], env: NodeJS.ProcessEnv = process.env): Promise<number> {
  return new Promise((resolve, reject) => {
    const child = spawn(path.join(projectRoot, "node_modules", ".bin", bin), args, {
      cwd: projectRoot,
      stdio: "inherit",
      env,
    });
    child.once("error", reject);
    child.once("exit", (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}
