// Partition functions: exact values, thermodynamic integration and large-N expansions (Mehta, Random
// Matrices, 3rd ed. 2004; Ginibre, J. Math. Phys. 6, 1965; Forrester, Log-gases and Random Matrices, 2010;
// the sources of each part are in its module).
export { logGamma, digamma, logFactorial } from './log-gamma'
export { logMehtaIntegral, gaussianLogZ, gaussianMeanEnergy, ginibreLogZ, exactLogZ, type LogZRequest, type LogZResult } from './exact'
export { thermodynamicIntegration, type MeanEnergyEstimate, type ThermodynamicIntegrationOptions, type ThermodynamicIntegrationResult } from './thermodynamic-integration'
export { logZExpansion, lineConstant, measureEntropy, PLANE_CONSTANT_BETA_2, type ExpansionRequest, type ExpansionResult, type ExpansionTerm } from './expansion'
