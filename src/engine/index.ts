// The engine's public surface: pure functions, no DOM, no Node APIs.
export * from './design/document.ts';
export { parseDesign, migrate, type ParseResult } from './design/validate.ts';
export { toSystem } from './design/convert.ts';
export type * from './system.ts';
export type { Issue } from './issues.ts';
export { airAt } from './air.ts';
export { analyze, rolloffHz, plannedVoltsRms, PORT_SPEED_LIMIT, SENSITIVITY_VOLTS, splDb } from './response/analyze.ts';
export { respond, passbandPressure } from './response/frequency.ts';
export type { Analysis, Curves, Figures, MaxSplLimit } from './response/types.ts';
export { suggestAlignments, type AlignmentSuggestion } from './align/index.ts';
export { DEFAULT_QL } from './box/common.ts';
export { verdict, LIMIT_WORDS, LIMIT_PHRASES, type VerdictLine, type HeadroomFinding } from './verdict/verdict.ts';
export { probabilityAtLeast } from './trial/binomial.ts';
export { synthesizeDemoTrack, type DemoTrack } from './demo/track.ts';
export { InputProblem } from './issues.ts';
