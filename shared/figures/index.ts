// Figures: result tables → Vega-Lite specs, captions and overlays.
export * from './types'
export * from './templates'
export * from './caption'
export { fitEnergyExpansion, evaluateExpansion, leastSquares, expansionModel, type ExpansionFit } from './fit'
export { wignerSurmise, surmiseCurve, type SurmiseBeta } from './wigner'
export { figureInk, figureFont } from './palette'
