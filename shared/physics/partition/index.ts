// Partition functions: exact values, thermodynamic integration and large-N expansions (MATH.md §6).
export { logGamma, digamma, logFactorial } from './log-gamma'
export { logMehtaIntegral, gaussianLogZ, gaussianMeanEnergy, ginibreLogZ, exactLogZ, type LogZRequest, type LogZResult } from './exact'
export { thermodynamicIntegration, type MeanEnergyEstimate, type ThermodynamicIntegrationOptions, type ThermodynamicIntegrationResult } from './thermodynamic-integration'
export { logZExpansion, lineConstant, measureEntropy, PLANE_CONSTANT_BETA_2, type ExpansionRequest, type ExpansionResult, type ExpansionTerm } from './expansion'
