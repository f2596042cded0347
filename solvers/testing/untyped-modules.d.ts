// Test-only npm packages that ship no type declarations (see ../shared/STACK.md).
declare module 'pathfinding';
declare module 'logic-solver';
declare module 'jstat';
