import { exportFormatOf, portfolioCodeOf } from "../../http/context";
import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { backtestQuerySchema, rollingQuerySchema } from "../../../shared/schemas/backtest";
import { sendTable } from "../../http/download";
import { getBacktest, getOverview, getRolling, getRollingJson } from "./backtest.service";
import { exceptionsTable, rollingTable } from "./backtest.tables";

export function backtestRouter() {
  const r = createGuardedRouter();
  r.get("/api/portfolios/:code/backtest", async (req, res) => {
    const code = portfolioCodeOf(req);
    const { asOf } = parseInput(backtestQuerySchema, req.query, "query");
    res.json(await getBacktest(code, asOf));
  });
  r.get("/api/portfolios/:code/rolling", async (req, res) => {
    const code = portfolioCodeOf(req);
    // Stored JSON, sent as it is: no parse and re-serialise of the whole history on each read.
    res.type("json").send(await getRollingJson(code, parseInput(rollingQuerySchema, req.query, "query")));
  });
  r.get("/api/portfolios/:code/exceptions.:format", async (req, res) => {
    const code = portfolioCodeOf(req);
    const format = exportFormatOf(req);
    const { asOf } = parseInput(backtestQuerySchema, req.query, "query");
    await sendTable(res, exceptionsTable(await getBacktest(code, asOf)), format);
  });
  r.get("/api/portfolios/:code/rolling.:format", async (req, res) => {
    const code = portfolioCodeOf(req);
    const format = exportFormatOf(req);
    const rows = await getRolling(code, parseInput(rollingQuerySchema, req.query, "query"));
    await sendTable(res, rollingTable(code, rows), format);
  });
  r.get("/api/overview", async (_req, res) => {
    res.json(await getOverview());
  });
  return r.router;
}
