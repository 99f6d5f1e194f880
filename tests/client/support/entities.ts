/** Entities as GET /api/entities answers them, from the invented Larkspur demo (override what a test needs). */
const entity = (code: string, name: string, regime: string, pnlBasis: string, currency: string) => ({
  code,
  name,
  regime,
  pnlBasis,
  currency,
  qualitativeAddend: 0,
  supervisorName: null,
  supervisorEmails: [] as string[],
  version: 1,
});

export const larkspurEU = entity("LKS-EU", "Larkspur Markets SA", "eu", "max", "EUR");
export const larkspurUS = entity("LKS-US", "Larkspur Securities LLC", "us", "actual", "USD");
export const larkspurUK = entity("LKS-UK", "Larkspur Bank plc", "frtb", "hypothetical", "GBP");

/** LKS-EU's first settings record, made with the entity and in force from the start, as a determination names it. */
export const larkspurEUInitialSettings = {
  id: 1,
  effectiveFrom: "1900-01-01",
  reference: "Settings entered when the entity was created",
  pnlBasis: "max",
  qualitativeAddend: 0,
  qualitativeAddendSvar: null,
  multiplierFloor: null,
  determinationFrequency: "quarterly",
};
