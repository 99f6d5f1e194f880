import { createGuardedRouter } from "../../http/routes";
import { entityCodeOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import {
  createEntityBodySchema,
  createHolidayBodySchema,
  holidayImportBodySchema,
  holidayImportQuerySchema,
  createPortfolioBodySchema,
  holidayParamSchema,
  portfolioParamSchema,
  updateEntityBodySchema,
  updatePortfolioBodySchema,
} from "../../../shared/schemas/entity";
import * as entities from "./entities.service";

export function entitiesRouter() {
  const r = createGuardedRouter();

  r.get("/api/entities", async (req, res) => {
    res.json(await entities.listEntities(signedInActor(req).user));
  });
  r.post("/api/entities", async (req, res) => {
    res.status(201).json(await entities.createEntity(parseInput(createEntityBodySchema, req.body), signedInActor(req)));
  });
  r.patch("/api/entities/:code", async (req, res) => {
    const code = entityCodeOf(req);
    res.json(await entities.updateEntity(code, parseInput(updateEntityBodySchema, req.body), signedInActor(req)));
  });

  r.get("/api/entities/:code/portfolios", async (req, res) => {
    res.json(await entities.listPortfolios(entityCodeOf(req), signedInActor(req).user));
  });
  r.post("/api/entities/:code/portfolios", async (req, res) => {
    const code = entityCodeOf(req);
    res
      .status(201)
      .json(await entities.createPortfolio(code, parseInput(createPortfolioBodySchema, req.body), signedInActor(req)));
  });
  r.patch("/api/entities/:code/portfolios/:portfolio", async (req, res) => {
    const { code, portfolio } = parseInput(portfolioParamSchema, req.params, "address");
    const { name } = parseInput(updatePortfolioBodySchema, req.body);
    res.json(await entities.renamePortfolio(code, portfolio, name, signedInActor(req)));
  });

  r.get("/api/entities/:code/holidays", async (req, res) => {
    res.json(await entities.listHolidays(entityCodeOf(req), signedInActor(req).user));
  });
  r.post("/api/entities/:code/holidays", async (req, res) => {
    const code = entityCodeOf(req);
    res
      .status(201)
      .json(await entities.addHoliday(code, parseInput(createHolidayBodySchema, req.body), signedInActor(req)));
  });
  r.delete("/api/entities/:code/holidays/:date", async (req, res) => {
    const { code, date } = parseInput(holidayParamSchema, req.params, "address");
    await entities.removeHoliday(code, date, signedInActor(req));
    res.status(204).end();
  });

  // The library's public holidays of a year: what an import would change, then the import itself.
  r.get("/api/entities/:code/holiday-import", async (req, res) => {
    const code = entityCodeOf(req);
    const { year } = parseInput(holidayImportQuerySchema, req.query, "query");
    res.json(await entities.previewHolidayImport(code, year));
  });
  r.post("/api/entities/:code/holiday-import", async (req, res) => {
    const code = entityCodeOf(req);
    const body = parseInput(holidayImportBodySchema, req.body);
    res.json(await entities.importLibraryHolidays(code, body, signedInActor(req)));
  });

  return r.router;
}
