// This module's public entry: what other server modules may use. Everything else in this folder is the
// module's own; eslint-plugin-boundaries reports an import that reaches past this file (eslint.config.js).
export { closedDaysOf } from './service.js';
