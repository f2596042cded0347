// Test fixture for the pool: seed -1 answers at once, seed -2 allocates until the heap limit
// kills the thread, anything else spins forever ignoring every signal (a solver that never stops).
module.exports = function spin(task) {
  if (task.seed === -1) return 'quick';
  if (task.seed === -2) {
    const hold = [];
    for (;;) hold.push(new Array(1e5).fill(Math.random()));
  }
  for (;;) { /* spin */ }
};
