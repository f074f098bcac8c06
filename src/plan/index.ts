export { buildTable, referenceMethodLabel, referencePatternLabel, type TablePlan } from './build-table.ts';
export { type CellResult, cellResultSchema } from './cell-result.ts';
export { specLabels } from './labels.ts';
export {
  compareMetric,
  higherIsBetter,
  jsonNumber,
  type MetricName,
  metricNames,
  metricValue,
} from './metric-direction.ts';
export { paretoFront, type TradeoffPoint } from './pareto.ts';
export { isCustomPattern, patternSpecs } from './pattern-specs.ts';
export {
  checkPlanSize,
  type PlanCell,
  planCellCount,
  planCells,
  planCoilArrays,
  referenceMethod,
  referenceSampling,
} from './plan-cells.ts';
export { type PlanProgress, ProgressClock } from './plan-progress.ts';
export {
  type MethodRecommendation,
  methodRecommendationSchema,
  type PlanRow,
  type PlanTable,
  planRowSchema,
  planTableSchema,
  type Recommendation,
  type RowPick,
  recommendationSchema,
  rowPickSchema,
  summarySchema,
} from './plan-table.ts';
export { describeTarget, meetsTarget, meetsTargets, recommend } from './recommend.ts';
export { type GridPosition, rowKey } from './row-key.ts';
export { runCell, runCellOutcome } from './run-cell.ts';
export { type RunCellFn, type RunPlanOptions, runPlan } from './run-plan.ts';
export { type RunPlanCellsOptions, runPlanCells } from './run-plan-cells.ts';
export { type Plan, type PlanInput, planPatternSchema, planSchema, planSchemaFor } from './schema.ts';
export { type Summary, summarize } from './statistics.ts';
export { csvColumns, csvField, tableToCsv } from './table-csv.ts';
export { type Target, targetBound, targetSchema } from './target-schema.ts';
export { checkPlan, type ValidatePlanOptions, validatePlan } from './validate-plan.ts';
