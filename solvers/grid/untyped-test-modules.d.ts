// Test-only npm packages without type declarations (see ../shared/STACK.md); used by distance.spec.ts.
declare module 'pathfinding';
