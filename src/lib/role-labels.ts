import type { Role } from "@shared/schemas/common";

export const roleLabels: Record<Role, string> = {
  analyst: "Analyst",
  cro: "Chief risk officer",
  treasury: "Treasury",
  regulator: "Regulator",
  admin: "Administrator",
};

export const roleIds = Object.keys(roleLabels) as Role[];
