/**
 * `orthodrome/report`: plain-data reports on a surface (mesh health,
 * curvature summary) and `KEY OP VALUE` requirements checked against a report.
 *
 * @packageDocumentation
 */
export { inspectSurface, inspectProblems, ZERO_THICKNESS, CAP_ANGLE_DEG, NEEDLE_ANGLE_DEG, LISTED_LOOPS, type InspectReport, type BoundaryLoopInfo } from '../report/inspect.js';
export { curvatureSummary, type CurvatureResult, type Stat } from '../report/curvature.js';
export { parseRequirement, checkRequirements, checkableKeys, type Requirement, type RequirementResult, type Comparison } from '../report/require.js';
