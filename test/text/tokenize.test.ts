import { describe, expect, it } from 'vitest';
import { stemmer } from 'stemmer';
import { tokenize } from '../../src-main/core/text/tokenize.ts';

describe('tokenize', () => {
  it('lower-cases, splits on anything but letters and digits, drops single characters and stop words', () => {
    expect(tokenize('The Lantern-Maker’s GUIDE, vol. 2 (2031 edition) a_b')).toEqual(['lantern', 'maker', 'guide', 'vol', '2031', 'edition']);
  });

  it('keeps accented and non-Latin words whole', () => {
    expect(tokenize('Crème brûlée für Ärzte — Ελληνικά')).toEqual(['crème', 'brûlée', 'für', 'ärzte', 'ελληνικά']);
  });

  it('keeps stop words when asked', () => {
    expect(tokenize('the end of it', { stopWords: false })).toEqual(['the', 'end', 'of', 'it']);
  });

  it('stems with Porter’s algorithm when asked (Porter 1980: caresses → caress, ponies → poni, relational → relat)', () => {
    expect(tokenize('caresses ponies relational', { stem: true })).toEqual(['caress', 'poni', 'relat']);
    expect(tokenize('hopeful gardens', { stem: true })).toEqual([stemmer('hopeful'), stemmer('gardens')]);
  });
});
