export { evaluateEligibility } from './evaluate.js'
export { characteristicsFrom } from './characteristics.js'
