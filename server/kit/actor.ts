import type { SessionUser } from "../../shared/schemas/auth";

/** What a service needs to know about who acts and from where — never the request itself. */
export interface Actor {
  user: SessionUser | null;
  ip: string | null;
  requestId: string | null;
}

/** An actor who is signed in: what every service that changes or reads business data takes. */
export type SignedIn = Actor & { user: SessionUser };
