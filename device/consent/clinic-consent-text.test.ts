import AsyncStorage from '@react-native-async-storage/async-storage';
import { consentTextVersion as builtInVersion } from '@/shared/consent/consent-text';
import { request } from '@/api/client';
import {
  readCachedConsentText,
  readConsentTextIds,
  refreshClinicConsentText,
  toShownConsentText,
} from './clinic-consent-text';

jest.mock('@/api/client', () => ({ request: jest.fn() }));
const mockedRequest = request as jest.MockedFunction<typeof request>;

const published = {
  id: '0b6f4c1e-7d2a-4e8b-9f31-5a2c6d7e8f90',
  version: 3,
  title: 'Recording consent',
  body: 'First paragraph.\n\nSecond paragraph.',
  isCurrent: true,
  publishedAt: '2026-11-01T09:00:00.000Z',
};

beforeEach(async () => {
  await AsyncStorage.clear();
  mockedRequest.mockReset();
});

test('when the clinic server answers, then its current text is kept and shown paragraph by paragraph', async () => {
  mockedRequest.mockResolvedValue({
    kind: 'ok',
    data: {
      texts: [
        { ...published, id: published.id.replace('0b', '1c'), version: 2, isCurrent: false },
        published,
      ],
    },
  });
  const kept = await refreshClinicConsentText();
  expect(kept?.id).toBe(published.id);
  expect(await readCachedConsentText()).toEqual(kept);
  expect(toShownConsentText(kept)).toEqual({
    id: published.id,
    version: 3,
    paragraphs: ['First paragraph.', 'Second paragraph.'],
  });
});

test('when the server cannot be reached, then the copy kept from an earlier fetch is used', async () => {
  mockedRequest.mockResolvedValueOnce({ kind: 'ok', data: { texts: [published] } });
  await refreshClinicConsentText();
  mockedRequest.mockResolvedValueOnce({
    kind: 'offline',
    temporary: true,
    message: 'Network unreachable',
  } as never);
  expect((await refreshClinicConsentText())?.version).toBe(3);
});

test('when nothing was ever fetched, then the built-in wording is shown with no published id', async () => {
  mockedRequest.mockResolvedValue({
    kind: 'offline',
    temporary: true,
    message: 'Network unreachable',
  } as never);
  const shown = toShownConsentText(await refreshClinicConsentText());
  expect(shown.id).toBeNull();
  expect(shown.version).toBe(builtInVersion);
  expect(shown.paragraphs.length).toBeGreaterThan(0);
});

test('when the clinic server answers, then the row id of every published version is kept for the consents signed on it', async () => {
  const earlier = { ...published, id: '1c6f4c1e-7d2a-4e8b-9f31-5a2c6d7e8f90', version: 1, isCurrent: false };
  mockedRequest.mockResolvedValue({ kind: 'ok', data: { texts: [published, earlier] } });
  await refreshClinicConsentText();
  // A consent signed on version 1 (the built-in wording every clinic starts with) names the clinic's own row.
  expect(await readConsentTextIds()).toEqual({ '1': earlier.id, '3': published.id });
});

test('when an older install kept only the current text, then its version still resolves to its id', async () => {
  await AsyncStorage.setItem(
    'fourpoint.clinic-consent-text',
    JSON.stringify({ id: published.id, version: 3, title: published.title, body: published.body }),
  );
  expect(await readConsentTextIds()).toEqual({ '3': published.id });
});

test('when nothing was ever fetched, then no version has an id (finishing asks to connect once)', async () => {
  expect(await readConsentTextIds()).toEqual({});
});
