import { connectedComponents } from './components';
import { gridFromText } from './grid';

describe('connectedComponents', () => {
  it('labels 4-connected regions and leaves blocked cells at -1', () => {
    // Two regions that touch only diagonally stay apart: agents move 4-connected.
    const grid = gridFromText('..@.\n.@..\n@@@.\n.@..');
    const { count, label, sizes } = connectedComponents(grid);
    expect(count).toBe(3);
    expect(Array.from(label)).toEqual([
      0, 0, -1, 1,
      0, -1, 1, 1,
      -1, -1, -1, 1,
      2, -1, 1, 1,
    ]);
    expect(sizes).toEqual([3, 6, 1]);
  });

  it('finds no component in a fully blocked grid', () => {
    expect(connectedComponents(gridFromText('@@\n@@')).count).toBe(0);
  });
});
