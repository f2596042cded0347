import { archiveName, uniquePaths } from './instance-set-archive';

describe('archive entry names', () => {
  it('keeps entries inside their folder and extractable on Windows', () => {
    expect(archiveName('../../etc/passwd')).toBe('.._.._etc_passwd');
    expect(archiveName('..')).toBe('_..');
    expect(archiveName('aisle:3 "north"?.map')).toBe('aisle_3 _north__.map');
    expect(archiveName('a<b>|c*.scen')).toBe('a_b__c_.scen');
    expect(archiveName('tab\there.map')).toBe('tab_here.map');
    expect(archiveName('   ')).toBe('_');
  });

  it('numbers paths that flattened alike or differ only in letter case, before the extension', () => {
    expect(uniquePaths(['maps/a_b.map', 'maps/a_b.map', 'maps/A_B.map', 'maps/plain', 'maps/plain', 'scenarios/a_b.map']))
      .toEqual(['maps/a_b.map', 'maps/a_b-2.map', 'maps/A_B-3.map', 'maps/plain', 'maps/plain-2', 'scenarios/a_b.map']);
  });
});
