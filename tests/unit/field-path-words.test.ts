import { describe, expect, it } from 'vitest';
import { describeIssue, fieldPathWords } from '~/core/field-path-words';

// Our own rule (issue 13, item 12): a validation message names the field in words a person
// reads, never as a machine path like `axes.0.edges.width`.
describe('field paths in words', () => {
  it.each([
    [['axes', 0, 'edges', 'width'], 'axis 1, edges, width'],
    [['axes', 1, 'quantity'], 'axis 2, quantity'],
    [['axes', 0, 'edges', 'edges', 3], 'axis 1, edges, edge 4'],
    [['serials', 4], 'serial 5'],
    [['device_type'], 'device type'],
    [['max_dvgs_v'], 'max VGS difference'],
    [['idss_a'], 'IDSS'],
    [['axes', 0, 'referenceCurrentA'], 'axis 1, reference current'],
    [['entries', 1], 'entry 2'],
    [[0], 'item 1'],
  ] as [PropertyKey[], string][])('%j → %s', (path, words) => {
    expect(fieldPathWords(path)).toBe(words);
  });

  it('does not say the field twice when the message starts with it', () => {
    expect(describeIssue(['axes', 0, 'edges', 'width'], 'width must be greater than 0, got -1')).toBe('axis 1, edges: width must be greater than 0, got -1');
    expect(describeIssue(['axes', 0, 'edges', 'startValue'], 'startValue must be a finite number')).toBe('axis 1, edges: start value must be a finite number');
    expect(describeIssue(['name'], 'is required')).toBe('name: is required');
    expect(describeIssue([], 'give serials (scanned) or a lot')).toBe('give serials (scanned) or a lot');
  });

  it('never leaves a dotted machine path', () => {
    expect(describeIssue(['axes', 0, 'edges', 'width'], 'must be positive')).not.toMatch(/\w\.\d|\.\w/);
  });
});
