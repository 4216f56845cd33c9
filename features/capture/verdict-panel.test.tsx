import { fireEvent, render, screen } from '@testing-library/react-native';
import type { AnalysisResult } from '@/shared/analysis/types';
import { colors } from '@/ui/theme';
import { VerdictPanel } from './verdict-panel';

function analysis(
  verdict: AnalysisResult['quality']['verdict'],
  reasons: AnalysisResult['quality']['reasons'] = [],
): AnalysisResult {
  return {
    sampleRate: 8000,
    durationS: 10,
    heartRateBpm: 72.4,
    sounds: [],
    quality: { verdict, reasons } as AnalysisResult['quality'],
    screen: { murmur: 'unlikely', score: 0.1, reasons: [] },
    analysisVersion: 'test',
    metrics: { irregularRhythm: false } as AnalysisResult['metrics'],
  };
}

describe('VerdictPanel', () => {
  test('when the take is good, then it can be kept at once and shows the rounded rate', () => {
    const onKeep = jest.fn();
    render(<VerdictPanel analysis={analysis('good')} busy={false} onKeep={onKeep} onRetake={jest.fn()} />);
    expect(screen.getByTestId('heart-rate').props.children).toBe('72 bpm');
    fireEvent.press(screen.getByTestId('keep-take'));
    expect(onKeep).toHaveBeenCalledWith(null);
  });

  test('when the take is poor, then a retake is offered with the reasons, and keeping it needs a note', () => {
    const onKeep = jest.fn();
    const onRetake = jest.fn();
    render(
      <VerdictPanel
        analysis={analysis('retake', [
          { code: 'too_short', message: 'The clip lasts 3.0 s; at least 8 s are needed.' },
        ])}
        busy={false}
        onKeep={onKeep}
        onRetake={onRetake}
      />,
    );
    expect(screen.getByTestId('reason-too_short')).toBeTruthy();
    expect(screen.queryByTestId('keep-take')).toBeNull();
    fireEvent.press(screen.getByTestId('keep-anyway'));
    expect(screen.getByTestId('keep-note-error')).toBeTruthy();
    expect(onKeep).not.toHaveBeenCalled();
    fireEvent.changeText(screen.getByTestId('keep-note'), 'Client could not lie still');
    fireEvent.press(screen.getByTestId('keep-anyway'));
    expect(onKeep).toHaveBeenCalledWith('Client could not lie still');
    fireEvent.press(screen.getByTestId('retake'));
    expect(onRetake).toHaveBeenCalled();
  });

  test('when the rhythm is flagged irregular, then it reads "refer to a licensed clinician", never a diagnosis', () => {
    const irregular = {
      ...analysis('usable'),
      metrics: { irregularRhythm: true } as AnalysisResult['metrics'],
    };
    render(<VerdictPanel analysis={irregular} busy={false} onKeep={jest.fn()} onRetake={jest.fn()} />);
    expect(String(screen.getByTestId('refer-note').props.children.join(''))).toContain(
      'refer to a licensed clinician',
    );
  });

  test('when the murmur screen says possible, then it reads "Possible murmur: refer to a licensed clinician" with its reasons in the caution colour', () => {
    const flagged: AnalysisResult = {
      ...analysis('good'),
      screen: { murmur: 'possible', score: 0.9, reasons: ['steady sound through systole in 20 of 22 beats'] },
    };
    render(<VerdictPanel analysis={flagged} busy={false} onKeep={jest.fn()} onRetake={jest.fn()} />);
    expect(screen.getByTestId('murmur-note')).toBeTruthy();
    expect(screen.getByText('Possible murmur: refer to a licensed clinician.').props.style).toEqual(
      expect.arrayContaining([expect.objectContaining({ color: colors.caution })]),
    );
    expect(screen.getByText(/steady sound through systole/)).toBeTruthy();
  });

  test('when the murmur screen is unlikely, then no murmur note shows', () => {
    render(<VerdictPanel analysis={analysis('good')} busy={false} onKeep={jest.fn()} onRetake={jest.fn()} />);
    expect(screen.queryByTestId('murmur-note')).toBeNull();
  });
});
