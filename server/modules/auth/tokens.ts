import { createSecretKey, type KeyObject } from "node:crypto";
import jwt from "jsonwebtoken";
import { z } from "zod";
import { config } from "../../config";

export const SESSION_COOKIE = "qm_session";
export const SESSION_TTL_SECONDS = 8 * 60 * 60; // one working day
const ISSUER = "quartermark";
const AUDIENCE = "quartermark-web";

const claimsSchema = z.object({ sub: z.string().regex(/^\d+$/), tv: z.number().int() });

/**
 * The HS256 key as a KeyObject, made once per secret: given the secret as a string, jsonwebtoken
 * first tries it as a public key on every call (a thrown error each time, about a tenth of the CPU
 * of a light request under load). The same bytes, so tokens signed either way verify.
 */
let sessionKey: { secret: string; key: KeyObject } | null = null;
function keyOf(secret: string): KeyObject {
  if (sessionKey?.secret !== secret) sessionKey = { secret, key: createSecretKey(Buffer.from(secret, "utf8")) };
  return sessionKey.key;
}

export function signSessionToken(userId: number, tokenVersion: number): string {
  return jwt.sign({ tv: tokenVersion }, keyOf(config.jwtSecret), {
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
    const payload = jwt.verify(token, keyOf(config.jwtSecret), {
      algorithms: ["HS256"],
      issuer: ISSUER,
      audience: AUDIENCE,
    });
    const claims = claimsSchema.safeParse(payload);
    if (!claims.success) return { ok: false, reason: "malformed claims" };
    return { ok: true, userId: Number(claims.data.sub), tokenVersion: claims.data.tv };
  } catch (err) {
    return { ok: false, reason: (err as Error).message };
  }
}
