import { render, screen } from '@testing-library/react-native';
import type { Comparison } from '@/shared/protocol/review';
import { ComparisonTable } from './comparison-table';

const mockDimensions = { width: 390, height: 844, scale: 1, fontScale: 1 };
jest.mock('react-native/Libraries/Utilities/useWindowDimensions', () => ({
  __esModule: true,
  default: () => mockDimensions,
}));

const row = (site: Comparison['rows'][number]['site'], then: number | null, now: number | null) => ({
  site,
  key: 'heartRateBpm',
  label: 'Heart rate',
  unit: 'bpm',
  then,
  now,
  change: then !== null && now !== null ? now - then : null,
});

const comparison: Comparison = {
  now: { id: '11111111-1111-4111-8111-111111111111', startedAt: '2026-10-07T10:00:00Z' },
  then: { id: '22222222-2222-4222-8222-222222222222', startedAt: '2026-05-06T10:00:00Z' },
  rows: [row('mitral', 64, 76), row('tricuspid', 70, 66), row('aortic', 72, 72), row('pulmonic', null, 71)],
  firstS1: [],
};

describe('ComparisonTable', () => {
  test.each([
    ['a phone', 390],
    ['a wide screen', 1440],
  ])('when shown on %s, then each site says the change with an arrow and in words', (_, width) => {
    mockDimensions.width = width;
    render(<ComparisonTable comparison={comparison} />);
    expect(screen.getByTestId('compare-mitral-heartRateBpm-change')).toHaveTextContent('↑ higher by 12 bpm');
    expect(screen.getByTestId('compare-tricuspid-heartRateBpm-change')).toHaveTextContent('↓ lower by 4 bpm');
    expect(screen.getByTestId('compare-aortic-heartRateBpm-change')).toHaveTextContent('→ about the same');
    expect(screen.getByTestId('compare-pulmonic-heartRateBpm-change')).toHaveTextContent(
      'not measured at both visits',
    );
    expect(screen.getByTestId('compare-mitral-heartRateBpm')).toHaveTextContent(
      width < 1000 ? 'Mitral64 then, 76 now↑ higher by 12 bpm' : '64 then, 76 now↑ higher by 12 bpm',
    );
  });
});
