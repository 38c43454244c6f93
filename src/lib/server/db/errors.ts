/** Driver error codes, answered by the engine module (see engine.ts). */
export { isDatabaseBusy, isUniqueViolation } from './engine';
