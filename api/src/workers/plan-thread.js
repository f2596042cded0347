// Piscina worker entry: registers tsx so the TypeScript task adapter (and the @shared/@solvers
// aliases of tsconfig.json) load inside the thread, then hands piscina the adapter's function.
// Plain JS because a worker thread does not inherit the loader of the process that spawned it.
require('tsx/cjs');
module.exports = require('./plan-thread.ts');
