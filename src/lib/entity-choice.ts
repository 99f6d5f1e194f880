/**
 * The entity a screen shows: the one the address names, matched ignoring case ("lks-eu" is LKS-EU),
 * else the first of `entities`. The matched entity's own code is what is sent and cached, so the
 * server and every key see one spelling; without a match the code is sent as written and the server
 * says it does not know it. "" when there is no entity at all.
 */
export function entityOf(entities: readonly { code: string }[], asked: string | null | undefined): string {
  const code = asked?.trim() || entities[0]?.code || "";
  return entities.find((e) => e.code.toUpperCase() === code.toUpperCase())?.code ?? code;
}
