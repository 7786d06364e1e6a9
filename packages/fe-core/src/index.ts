/**
 * Public API of fe-core, the Phaseloop finite-element engine (pure TypeScript, no I/O).
 *
 * Typical use (worker, CLI, tests):
 *   const parsed = parseModel(json);                 // from @phaseloop/shared: schema + references
 *   const problem = buildProblem(parsed.model);      // arrays, dofs, kernels, materials, loads
 *   const result = await runAnalysisAsync(problem, { onIteration, onFrame, shouldStop });
 *   const doc = buildResultDocument(problem, result, seconds);   // RESULT.json
 *   frameToVtu(problem, frame, fields) / framesToPvd(...) / historyCsv(frames)
 */
export { parseModel, modelSchema, modelJsonSchema, type Model, type ModelInput, type ModelIssue } from '@phaseloop/shared';

export { buildProblem, describeDof, nodalTemperatures, ModelError, type Problem, type ProblemElement } from './assembly/problem';
export { Assembler, buildPattern, type AssemblyInput, type AssemblyStatus } from './assembly/assembler';
export { numberDofs, recoverReactions, type DofNumbering } from './constraints/dirichlet';

export {
  runAnalysis,
  runAnalysisAsync,
  analysisSteps,
  type AnalysisOptions,
  type AnalysisHooks,
  type AnalysisResult,
  type AnalysisFailure,
  type FailureKind,
  type IterationInfo,
  type CutBackInfo,
} from './solve/nonlinear/driver';
export { defaultSolverFactory, type SolverKind } from './solve/nonlinear/solverChoice';
export { ProfileLuSolver } from './solve/fallback';
export { createLinearSolver, type LinearSolver, type LinearSolverOptions } from './solve/linear';
export { SingularMatrixError, type CsrMatrix, type SparseDirectSolver } from './solve/linear/types';

export * as mesh from './mesh/structured';
export type { MeshPart, MeshNode, MeshElement, EdgeRef, ContinuumType } from './mesh/structured';

export { vonMises, principalValues, nodalAverage, extrapolateToNodes, nearestNode, reportPoints, type Frame } from './output/frame';
export { patchRecovery, recoverNodal } from './output/recovery';
export { locatePoint, interpolate, type Probe } from './output/probe';
export { nodalField, pointField, kelvinToTensor, TENSOR_COMPONENTS, type NodalField } from './output/fields';
export { frameHistory } from './output/history';
export { frameToVtu, framesToPvd, vtuFileName } from './output/vtu';
export { historyCsv, nodalCsv } from './output/csv';
export { buildResultDocument, RESULT_FORMAT, SOLVER_NAME, SOLVER_VERSION, type ResultDocument } from './output/result';

export { createMaterial, isMaterialAvailable, MaterialNotAvailableError } from './material';
export type { Material, MaterialReport, MaterialPointInput, MaterialPointOutput } from './material/types';
export { ReducedMaterial, type StressState } from './material/reduce';
export { elementKernels, getElementKernel, type ElementKernel, type ElementName, type Section } from './element';
export { templates, presets as historyPresets, TemplateParamsError, DEMO_SUPERELASTIC, DEMO_ACTUATOR, type TemplateDefinition, type TemplatePreset, type CurveSpec, type CurveAxis, type LoadQuantity, type MeshSize, type SizeEstimate } from './templates';
export { parseGmsh, GmshFormatError, type GmshMesh, type GmshOptions } from './mesh/gmsh';
