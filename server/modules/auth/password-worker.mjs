// One bcrypt job per call, run in a worker thread of the password pool (password-hashing.ts), so a
// burst of sign-ins never blocks the event loop that serves everyone else. Plain JavaScript: the
// same file runs under tsx and beside the production bundle.
import bcrypt from "bcryptjs";

export default function passwordJob(job) {
  if (job.kind === "hash") return bcrypt.hash(job.password, job.cost);
  if (job.kind === "compare") return bcrypt.compare(job.password, job.hash);
  throw new Error(`Unknown password job: ${String(job.kind)}`);
}
