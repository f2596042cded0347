/** Conversions between a MapfInstance and its transferable TaskInstance form. */
import type { MapfInstance } from '../instance';
import type { TaskInstance } from './plan-task';

/** The transferable form of `instance`. */
export function toTaskInstance(instance: MapfInstance): TaskInstance {
  const { width, height, passable } = instance.grid;
  let cells = '';
  for (let i = 0; i < passable.length; i++) cells += passable[i] === 1 ? '1' : '0';
  return { width, height, cells, agents: instance.agents.map((a) => ({ ...a })) };
}

/** Rebuilds the instance; throws when `cells` does not have width × height characters of 0/1. */
export function fromTaskInstance(task: TaskInstance): MapfInstance {
  const n = task.width * task.height;
  if (!Number.isInteger(task.width) || !Number.isInteger(task.height) || task.width < 1 || task.height < 1) {
    throw new Error(`task instance: width and height must be positive integers, got ${task.width} × ${task.height}`);
  }
  if (task.cells.length !== n) throw new Error(`task instance: field "cells" has ${task.cells.length} characters, expected ${n}`);
  const passable = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const ch = task.cells.charCodeAt(i);
    if (ch !== 48 && ch !== 49) throw new Error(`task instance: field "cells" has "${task.cells[i]}" at ${i}; only 0 and 1 are allowed`);
    passable[i] = ch - 48;
  }
  return { grid: { width: task.width, height: task.height, passable }, agents: task.agents };
}
