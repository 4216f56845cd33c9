import { changeWords } from './change-words';

describe('changeWords', () => {
  test('when the later visit is higher, then an up arrow and "higher by" with the unit', () => {
    expect(changeWords(64, 76, 'bpm')).toEqual({ arrow: '↑', words: 'higher by 12 bpm' });
  });

  test('when the later visit is lower, then a down arrow and "lower by" at the figure’s precision', () => {
    expect(changeWords(1.42, 1.3)).toEqual({ arrow: '↓', words: 'lower by 0.12' });
  });

  test('when the change is below the precision shown, then "about the same"', () => {
    expect(changeWords(72.001, 72.003, 'bpm')).toEqual({ arrow: '→', words: 'about the same' });
  });

  test('when one visit has no value, then no arrow and it says so', () => {
    expect(changeWords(null, 70, 'bpm')).toEqual({ arrow: '', words: 'not measured at both visits' });
  });
});
