/** The standing caution on every screen (DESIGN.md §10); the packs carry the same words. */
export { CAUTION } from "@shared/schemas/common";
