// External potentials: the contract, the presets and the safe expression language.
export type { Potential, PotentialPreset } from './types'
export { doubleWellPotential, presetPotential, quadraticPotential, quarticPotential, radialPowerPotential } from './presets'
export { EXPRESSION_LIMITS, parsePotential } from './expression'
export type { ParsedPotential, ParseOptions } from './expression'
