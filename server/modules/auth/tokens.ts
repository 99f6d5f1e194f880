import jwt from "jsonwebtoken";
import { z } from "zod";
import { config } from "../../config";

export const SESSION_COOKIE = "qm_session";
export const SESSION_TTL_SECONDS = 8 * 60 * 60; // one working day
const ISSUER = "quartermark";
const AUDIENCE = "quartermark-web";

const claimsSchema = z.object({ sub: z.string().regex(/^\d+$/), tv: z.number().int() });

export function signSessionToken(userId: number, tokenVersion: number): string {
  return jwt.sign({ tv: tokenVersion }, config.jwtSecret, {
    algorithm: "HS256",
    subject: String(userId),
    issuer: ISSUER,
    audience: AUDIENCE,
    expiresIn: SESSION_TTL_SECONDS,
  });
}

/** Verifies signature (HS256 only, so `alg: none` and key confusion fail), issuer, audience, expiry. */
export function verifySessionToken(
  token: string,
): { ok: true; userId: number; tokenVersion: number } | { ok: false; reason: string } {
  try {
    const payload = jwt.verify(token, config.jwtSecret, { algorithms: ["HS256"], issuer: ISSUER, audience: AUDIENCE });
    const claims = claimsSchema.safeParse(payload);
    if (!claims.success) return { ok: false, reason: "malformed claims" };
    return { ok: true, userId: Number(claims.data.sub), tokenVersion: claims.data.tv };
  } catch (err) {
    return { ok: false, reason: (err as Error).message };
  }
}
