import { describe, expect, it } from 'vitest';
import { choiceLabel, filterChoices, highlightParts, matchesTyped } from '../../../src/features/screening/choices';

const labels = (typed: string) => filterChoices(typed).map(choiceLabel);

describe('the decision chooser picks a line by its first letters', () => {
  it('matches the start of a label, the starts of its words in order, or its initials', () => {
    expect(matchesTyped('No usable statistics', 'no us')).toBe(true);
    expect(matchesTyped('No usable statistics', 'us st')).toBe(true);
    expect(matchesTyped('No usable statistics', 'nus')).toBe(true);
    expect(matchesTyped('No usable statistics', 'st us')).toBe(false);
    expect(matchesTyped('Wrong population', 'pop')).toBe(true);
    expect(matchesTyped('Wrong population', 'rong')).toBe(false);
  });

  it('filters the lines as a screener types', () => {
    expect(labels('')).toHaveLength(7);
    expect(filterChoices('', 'full_text').map(choiceLabel)).toEqual(['Include', 'No usable statistics', 'Wrong population', 'Not about time perception', 'Review article', 'Duplicate publication', 'Full text not available', 'Other (explained)']);
    expect(labels('inc')).toEqual(['Include']);
    expect(labels('wr')).toEqual(['Wrong population']);
    expect(labels('no')).toEqual(['Not about time perception']);
    expect(filterChoices('no', 'full_text').map(choiceLabel)).toEqual(['No usable statistics', 'Not about time perception', 'Full text not available']);
    expect(labels('wi')).toEqual(['Without a reason']);
    expect(labels('rev')).toEqual(['Review article']);
    expect(labels('dp')).toEqual(['Duplicate publication']);
    expect(labels('ex')).toHaveLength(6);
    expect(labels('zzz')).toEqual([]);
  });
});

describe('terms from the vocabulary are marked in an abstract', () => {
  it('marks whole words in any case, a plural too, the longest term first', () => {
    const parts = highlightParts('Numerosity and looming discs; more durations. Loom is not looming.', ['numerosity', 'Looming', 'looming discs', 'duration']);
    expect(parts.filter((p) => p.term).map((p) => p.text)).toEqual(['Numerosity', 'looming discs', 'durations', 'looming']);
    expect(parts.map((p) => p.text).join('')).toBe('Numerosity and looming discs; more durations. Loom is not looming.');
  });

  it('leaves text without terms whole, and ignores terms shorter than three letters', () => {
    expect(highlightParts('brief flashes', ['ab', ''])).toEqual([{ text: 'brief flashes', term: false }]);
    expect(highlightParts('', ['numerosity'])).toEqual([]);
    expect(highlightParts('filled_interval vs filled interval', ['filled_interval']).filter((p) => p.term)).toHaveLength(2);
  });
});
