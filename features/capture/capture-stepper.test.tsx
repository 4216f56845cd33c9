import { fireEvent, render, screen } from '@testing-library/react-native';
import type { SiteRecording } from '@/device/local-store/records';
import type { Site } from '@/shared/protocol';
import { CaptureStepper, nextOpenSite, stepState } from './capture-stepper';

function settled(
  site: Site,
  outcome: 'recorded' | 'skipped',
  verdict: SiteRecording['verdict'] = 'good',
): SiteRecording {
  return {
    id: `r-${site}`,
    sessionId: 's',
    site,
    outcome,
    source: outcome === 'recorded' ? 'microphone' : null,
    skipReason: outcome === 'skipped' ? 'Client declined this site' : null,
    note: null,
    verdict: outcome === 'recorded' ? verdict : null,
    heartRateBpm: null,
    durationS: null,
    sampleRate: null,
    analysis: null,
    trace: null,
    hasPlainClip: outcome === 'recorded',
    blobHash: null,
    sizeBytes: null,
    updatedAt: '2026-01-01T00:00:00.000Z',
  };
}

// The order mitral, tricuspid, aortic, pulmonic is the brief's capture order.
describe('nextOpenSite', () => {
  test('when nothing is recorded, then the next site is mitral', () => {
    expect(nextOpenSite([])).toBe('mitral');
  });

  test('when mitral is kept, then the next site is tricuspid', () => {
    expect(nextOpenSite([settled('mitral', 'recorded')], 'mitral')).toBe('tricuspid');
  });

  test('when tricuspid is skipped after an earlier redo of aortic, then the step after aortic comes next and wraps to open ones', () => {
    const done = [
      settled('mitral', 'recorded'),
      settled('aortic', 'recorded'),
      settled('pulmonic', 'skipped'),
    ];
    expect(nextOpenSite(done, 'aortic')).toBe('tricuspid');
  });

  test('when all four are recorded or skipped, then the session goes to review', () => {
    const done = [
      settled('mitral', 'recorded'),
      settled('tricuspid', 'skipped'),
      settled('aortic', 'recorded'),
      settled('pulmonic', 'recorded'),
    ];
    expect(nextOpenSite(done, 'pulmonic')).toBe('review');
  });
});

describe('CaptureStepper', () => {
  test('when sites are in different states, then each step says which, and a poor kept take is marked apart', () => {
    const done = [
      settled('mitral', 'recorded'),
      settled('tricuspid', 'recorded', 'retake'),
      settled('pulmonic', 'skipped'),
    ];
    expect(stepState('aortic', 'aortic', done)).toBe('current');
    render(<CaptureStepper current="aortic" recordings={done} onSelect={jest.fn()} />);
    expect(screen.getByTestId('step-mitral-recorded')).toBeTruthy();
    expect(screen.getByTestId('step-tricuspid-kept-poor')).toBeTruthy();
    expect(screen.getByTestId('step-aortic-current')).toBeTruthy();
    expect(screen.getByTestId('step-pulmonic-skipped')).toBeTruthy();
  });

  test('when a finished step is pressed, then it is selected for a redo', () => {
    const onSelect = jest.fn();
    render(
      <CaptureStepper current="aortic" recordings={[settled('mitral', 'recorded')]} onSelect={onSelect} />,
    );
    fireEvent.press(screen.getByTestId('step-mitral'));
    expect(onSelect).toHaveBeenCalledWith('mitral');
  });

  test('when the stepper is disabled while saving, then pressing a step does nothing', () => {
    const onSelect = jest.fn();
    render(<CaptureStepper current="aortic" recordings={[]} onSelect={onSelect} disabled />);
    fireEvent.press(screen.getByTestId('step-mitral'));
    expect(onSelect).not.toHaveBeenCalled();
  });
});
