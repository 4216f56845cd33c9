import { fireEvent, render, screen } from '@testing-library/react-native';
import { cautionParagraphs } from '@/shared/cautions';
import { CautionLine } from './caution-line';

describe('CautionLine', () => {
  test('when shown, then it is one line, and "details" opens the full caution and closes it again', () => {
    render(<CautionLine />);
    expect(screen.getByTestId('caution-line')).toHaveTextContent('Wellness follow-up only · details');
    expect(screen.queryByText(cautionParagraphs[0])).toBeNull();

    fireEvent.press(screen.getByTestId('caution-line-toggle'));
    for (const p of cautionParagraphs) expect(screen.getByText(p)).toBeTruthy();

    fireEvent.press(screen.getByTestId('caution-line-toggle'));
    expect(screen.queryByText(cautionParagraphs[0])).toBeNull();
  });
});
