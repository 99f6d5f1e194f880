import type { Role } from "../../shared/schemas/common";

/**
 * Who may hold personal API tokens for scripts (docs/architecture.md#roles); a token stops working
 * when its owner leaves these roles. The policy table and the services read it here.
 */
export const TOKEN_HOLDERS: readonly Role[] = ["treasury"];
