import { render, screen } from '@testing-library/react-native';
import { StyleSheet } from 'react-native';
import { clipLevel, LevelMeter, levelHint, quietLevel } from './level-meter';

function fillWidth(): string {
  return String(StyleSheet.flatten(screen.getByTestId('level-meter-fill').props.style).width);
}

describe('LevelMeter', () => {
  test('when the input peaks at full scale, then the meter warns of clipping', () => {
    render(<LevelMeter level={1} />);
    expect(screen.getByTestId('level-hint-too-loud')).toBeTruthy();
    expect(fillWidth()).toBe('100.0%');
  });

  test('when the input is near silence, then the meter asks to check the chest piece', () => {
    render(<LevelMeter level={0.005} />);
    expect(screen.getByTestId('level-hint-too-quiet')).toBeTruthy();
  });

  test('when the input peaks at a quarter of full scale, then the bar shows half (square-root scale) and no warning', () => {
    render(<LevelMeter level={0.25} />);
    expect(fillWidth()).toBe('50.0%');
    expect(screen.getByTestId('level-hint-ok')).toBeTruthy();
    expect(screen.getByTestId('level-meter').props.accessibilityValue.now).toBe(25);
  });

  test('when the level is not a number or out of range, then the bar is clamped rather than broken', () => {
    render(<LevelMeter level={Number.NaN} />);
    expect(fillWidth()).toBe('0.0%');
  });

  test('when levels sit on the thresholds, then the hint changes exactly there', () => {
    expect(levelHint(clipLevel)).toBe('too-loud');
    expect(levelHint(clipLevel - 0.001)).toBe('ok');
    expect(levelHint(quietLevel)).toBe('ok');
    expect(levelHint(quietLevel - 0.001)).toBe('too-quiet');
  });
});
