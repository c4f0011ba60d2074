import { describe, expect, it } from 'vitest';
import { tabAfterKey } from '~/components/ui/tab-keys';

// The keyboard model of a tab list from the WAI-ARIA Authoring Practices ("Tabs" pattern):
// Left/Right move to the previous/next tab and wrap at the ends; Home/End go to the first/last.
describe('tabAfterKey', () => {
  it.each([
    ['ArrowRight', 0, 4, 1],
    ['ArrowRight', 3, 4, 0],
    ['ArrowLeft', 0, 4, 3],
    ['ArrowLeft', 2, 4, 1],
    ['Home', 2, 4, 0],
    ['End', 0, 4, 3],
  ])('%s from tab %i of %i goes to tab %i', (key, index, count, want) => {
    expect(tabAfterKey(key, index, count)).toBe(want);
  });
  it('ignores other keys and empty strips', () => {
    expect(tabAfterKey('Enter', 1, 4)).toBeNull();
    expect(tabAfterKey('ArrowDown', 1, 4)).toBeNull();
    expect(tabAfterKey('ArrowRight', 0, 0)).toBeNull();
  });
});
