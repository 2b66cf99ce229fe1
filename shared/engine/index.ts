/**
 * Pointfold's symmetry engine: perceive the point group of a nearly symmetric structure within a
 * tolerance, build the tolerance ladder, snap onto exact symmetry by projection, orient in the
 * standard frame and report. Pure TypeScript (no Node or DOM). DEVELOPERS.md, "The engine", maps
 * the steps to the files.
 */
export { EngineError, engineErrorCodes, isEngineError, type EngineErrorCode } from './errors';
export { perceive, pointGroupAt, ladder, type Perception } from './perceive';
export { snap, ENGINE_VERSION } from './report';
export { allowedTargets } from './targets';
export { groupOrder, isKnownGroup, parseGroupName } from './groups';
export { MAX_ATOMS } from './molecule';
export { LADDER_MIN, LADDER_MAX, LADDER_RUNGS } from './ladder';
