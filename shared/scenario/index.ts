// Public interface of the scenario format and the grading engine (see README.md beside this file).
export * from './schema'
export * from './objectiveSchema'
export { checkScenario, jsonPath, methodProblems, type ScenarioCheck, type ScenarioProblem } from './check'
export { toSimulationSetup } from './setup'
export {
  grade,
  GradeInputError,
  type GradeOptions,
  type GradeResult,
  type HintUse,
  type ObjectiveResult,
  type SafetyViolation,
} from './grade'
export { createLiveGrader, type LiveGrader } from './liveGrader'
export { formatTime } from './format'
export * from './assistance'
export * from './names'
export { injectableFaults, INJECTABLE_GROUPS, type InjectableFault } from './injectable'
export { faultAnswer, readingsDiffer, tellingReading, MATERIAL_VOLTS, type DiagnosisAnswer } from './method'
