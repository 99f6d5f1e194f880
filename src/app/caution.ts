/** The standing caution on every screen (DESIGN.md §10). */
export const CAUTION =
  "Figures are decision support. The supervisor, the applicable rules and the approved model documentation govern; qualified staff review every figure before filing.";
