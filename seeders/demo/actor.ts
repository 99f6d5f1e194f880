import { UserModel } from "../../server/models/user";
import { toSessionUser } from "../../server/modules/auth/auth.service";

/** A demo user as the actor of the services a seed calls, as if they had signed in. */
export function actorOf(user: UserModel) {
  return { user: toSessionUser(user), ip: "127.0.0.1", requestId: "demo-seed" };
}

/** The demo user with this e-mail as an actor; the foundation seed made them. */
export async function demoActor(email: string) {
  const user = await UserModel.findOne({ where: { email } });
  if (!user) throw new Error(`The demo user ${email} is missing: the foundation seed must run first.`);
  return actorOf(user);
}
