/**
 * Decant's mobile-phase chemistry: pure functions, no I/O, run in the browser
 * and on the server alike. Inputs are single objects; units are in the field
 * names.
 */
export { reagents, getReagent, reagentDensity, reagentPurity } from "./reagents";
export type { Reagent, PhysicalForm, ReagentRole, WasteStream, GhsData, GhsPictogram, Sourced, AcidBaseData } from "./reagents";
export { ACID_SYSTEMS, systemPKa, pKaAtTemperature } from "./acid-systems";
export type { AcidSystem, AcidSystemId, StrongIonId } from "./acid-systems";
export { solutionPH } from "./equilibrium";
export type { SolutionPHInput, SolutionPHResult, SpeciesConcentration, ComponentInput } from "./equilibrium";
export { designBuffer } from "./buffer";
export type { DesignBufferInput, DesignBufferResult, BufferComponent, BufferBasis } from "./buffer";
export { mixMobilePhase } from "./mixing";
export { mobilePhasePH, mobilePhaseLimits, aqueousPHLimits } from "./hydro-organic";
export type { MobilePhasePHInput, MobilePhasePHResult, MixedPKa } from "./hydro-organic";
export type { Purities, LotDensities } from "./lot-assay";
export type { MixMobilePhaseInput, MixMobilePhaseResult, MixComponent, SolventShare } from "./mixing";
export { ADDITIVE_UNITS } from "./additive-units";
export type { AdditiveUnit } from "./additive-units";
export { solventUse } from "./solvent-use";
export type { SolventUseInput, SolventUseResult, ProgramPoint } from "./solvent-use";
export { fitLSS, predictRetention, gradientRetention } from "./retention";
export type { FitLSSInput, LSSParameters, PredictRetentionInput, GradientRetentionInput } from "./retention";
export { mixtureProperties } from "./mixture-properties";
export type { MixturePropertiesInput, MixturePropertiesResult } from "./mixture-properties";
export { WARNING_CODES, ERROR_CODES, ChemInputError } from "./warnings";
export type { ChemWarning, WarningCode, ChemErrorCode } from "./warnings";
export { SOURCES } from "./sources";
export type { Source, SourceKey, Confidence } from "./sources";
export {
  substituteSolvent,
  fromMethanolEquivalent,
  toMethanolEquivalent,
  lssStrengthRatio,
  ORGANIC_MODIFIERS,
  SOLVENT_STRENGTH,
} from "./substitution";
export type { SubstituteSolventInput, SubstituteSolventResult, OrganicModifier, ModifierBlend } from "./substitution";
export { transferMethod, columnVolume_mL } from "./column-transfer";
export type { TransferMethodInput, TransferMethodResult, ColumnGeometry, TransferKeep } from "./column-transfer";
export { methodGreenness, EHS_INDICES, HPLC_EAT } from "./greenness";
export type { MethodGreennessInput, MethodGreennessResult } from "./greenness";
