import type { CellKeyDownEvent } from 'ag-grid-community';
import { cellLink, followCellLinkOnEnter, leaveGridOnTab } from './grid-keyboard';

describe('grid keyboard', () => {
  /** A focused grid cell holding `content`, and a cellKeyDown event for `key` on it. */
  function cellWith(content: Node | null, key: string, modifiers: Partial<KeyboardEventInit> = {}): { event: CellKeyDownEvent; keyEvent: KeyboardEvent } {
    const cell = document.createElement('div');
    cell.className = 'ag-cell';
    if (content) cell.appendChild(content);
    document.body.appendChild(cell);
    const keyEvent = new KeyboardEvent('keydown', { key, cancelable: true, ...modifiers });
    Object.defineProperty(keyEvent, 'target', { value: cell });
    return { event: { event: keyEvent } as unknown as CellKeyDownEvent, keyEvent };
  }

  afterEach(() => document.body.replaceChildren());

  it('follows the link of the focused cell on Enter, and only on a plain Enter', () => {
    const link = cellLink('/plans/view?result=7', 'Replay', 'Replay result 7');
    const clicks: string[] = [];
    link.addEventListener('click', (e) => { e.preventDefault(); clicks.push(link.getAttribute('href') ?? ''); });

    const enter = cellWith(link, 'Enter');
    followCellLinkOnEnter(enter.event);
    expect(clicks).toEqual(['/plans/view?result=7']);
    expect(enter.keyEvent.defaultPrevented).toBe(true);

    followCellLinkOnEnter(cellWith(link, ' ').event);
    followCellLinkOnEnter(cellWith(link, 'Enter', { ctrlKey: true }).event);
    expect(clicks).toHaveLength(1);
  });

  it('does nothing on Enter in a cell without a link', () => {
    const plain = cellWith(document.createTextNode('solved'), 'Enter');
    followCellLinkOnEnter(plain.event);
    expect(plain.keyEvent.defaultPrevented).toBe(false);
  });

  it('draws cell links as no tab stops of their own, and lets Tab leave the grid', () => {
    const link = cellLink('/x', 'Replay', 'Replay result 1');
    expect(link.tabIndex).toBe(-1);
    expect(link.getAttribute('aria-label')).toBe('Replay result 1');
    expect(leaveGridOnTab()).toBe(false);
  });
});
