import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { portfolioCodeParamSchema } from "../../../shared/schemas/common";
import { backtestQuerySchema, rollingQuerySchema } from "../../../shared/schemas/backtest";
import { exportFormatParamSchema } from "../../../shared/schemas/table-export";
import { sendDownload } from "../../http/download";
import { tableDownload } from "../../kit/table-export";
import { getBacktest, getOverview, getRolling, getRollingJson } from "./backtest.service";
import { exceptionsTable, rollingTable } from "./backtest.tables";

export function backtestRouter() {
  const r = createGuardedRouter();
  r.get("/api/portfolios/:code/backtest", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    const { asOf } = parseInput(backtestQuerySchema, req.query, "query");
    res.json(await getBacktest(code, asOf));
  });
  r.get("/api/portfolios/:code/rolling", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    // Stored JSON, sent as it is: no parse and re-serialise of the whole history on each read.
    res.type("json").send(await getRollingJson(code, parseInput(rollingQuerySchema, req.query, "query")));
  });
  r.get("/api/portfolios/:code/exceptions.:format", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    const { format } = parseInput(exportFormatParamSchema, req.params, "address");
    const { asOf } = parseInput(backtestQuerySchema, req.query, "query");
    sendDownload(res, await tableDownload(exceptionsTable(await getBacktest(code, asOf)), format));
  });
  r.get("/api/portfolios/:code/rolling.:format", async (req, res) => {
    const { code } = parseInput(portfolioCodeParamSchema, req.params, "address");
    const { format } = parseInput(exportFormatParamSchema, req.params, "address");
    const rows = await getRolling(code, parseInput(rollingQuerySchema, req.query, "query"));
    sendDownload(res, await tableDownload(rollingTable(code, rows), format));
  });
  r.get("/api/overview", async (_req, res) => {
    res.json(await getOverview());
  });
  return r.router;
}
