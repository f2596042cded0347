import { ELLIPSIS, middleEllipsis } from './middle-ellipsis';
import { MiddleEllipsisPipe, OPTION_NAME_CHARS } from './middle-ellipsis.pipe';

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

describe('MiddleEllipsisPipe', () => {
  it('cuts a long option name to the default width and leaves a short or missing one readable', () => {
    const pipe = new MiddleEllipsisPipe();
    const long = 'warehouse-large-aisles-even-scenario-25';
    expect([...pipe.transform(long)]).toHaveLength(OPTION_NAME_CHARS);
    expect(pipe.transform(long).endsWith('scenario-25')).toBe(true);
    expect(pipe.transform('quay-north')).toBe('quay-north');
    expect(pipe.transform(null)).toBe('');
  });
});
