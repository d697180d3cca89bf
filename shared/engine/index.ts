// The engine's public surface: pure functions, typed input and output, no I/O.
export * from "./schema.js";
export * from "./conductors.js";
export { CAUTIONS } from "./cautions.js";
export {
  solveSystem,
  solveCompiled,
  parseSystem,
  compileSystem,
  applyCase,
  classify,
  formatPath,
  type SolveResult,
  type SolveSuccess,
  type SolveFailure,
  type EngineError,
  type EngineErrorCode,
  type Finding,
  type CaseResult,
  type LoadResult,
  type RunResult,
  type PointResult,
  type SourceResult,
  type WorstLoad,
  type CompiledSystem,
  type SolveOptions,
  type WorkLimits,
} from "./system.js";
export { solveCircuit, prepareCircuit, solvePrepared, type Netlist, type CircuitElement, type CircuitResult } from "./circuit.js";
export { autosize, costsSchema, type AutosizeResult, type Costs } from "./autosize.js";
