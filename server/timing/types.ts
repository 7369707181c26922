/**
 * Types shared by the engine's modules: the result contract lives in
 * shared/types/analysis.ts (one definition for the engine, the API and the UI); this module
 * re-exports the edge and stage part of it for the engine's relative imports.
 */
export type { Corners, EdgeShape, Warning, StageEdgeModel, ChainResult } from '../../shared/types/analysis'
