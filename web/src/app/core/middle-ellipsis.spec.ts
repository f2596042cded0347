import { ELLIPSIS, middleEllipsis } from './middle-ellipsis';

describe('middleEllipsis', () => {
  it('leaves a name that fits as it is', () => {
    expect(middleEllipsis('quay-north', 10)).toBe('quay-north');
  });

  it('cuts the middle, keeping more of the distinguishing end (hand-worked: 9 kept = 3 + 6)', () => {
    expect(middleEllipsis('warehouse-large-even-25', 10)).toBe(`war${ELLIPSIS}ven-25`);
    expect(middleEllipsis('warehouse-large-even-26', 10)).not.toBe(middleEllipsis('warehouse-large-even-25', 10));
    expect([...middleEllipsis('warehouse-large-even-25', 10)]).toHaveLength(10);
  });
});
