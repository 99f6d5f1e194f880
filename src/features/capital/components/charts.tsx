// The charts live in their own module so that recharts loads only when the Capital screen draws one.
export { HistoryChart } from "./history-chart";
export { DistributionChart } from "./distribution-chart";
