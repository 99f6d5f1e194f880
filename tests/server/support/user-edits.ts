import request from "supertest";
import { testApp } from "../helpers";

const app = testApp();

/**
 * Whoever holds `cookie` edits a user (name, role, disabled) and sends the version they saw, as every admin edit
 * does; the caller checks the answer.
 */
export function editUser(cookie: string, userId: number, body: Record<string, unknown>) {
  return request(app).patch(`/api/users/${userId}`).set("Cookie", cookie).send(body);
}
