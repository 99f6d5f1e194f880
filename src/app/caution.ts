/** The standing caution on every screen (docs/architecture.md#caution); the packs carry the same words. */
export { CAUTION } from "@shared/schemas/common";
