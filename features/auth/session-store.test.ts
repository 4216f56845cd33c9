import AsyncStorage from '@react-native-async-storage/async-storage';
import { Platform } from 'react-native';
import { loadSession, saveSession } from './session-store';

const user = {
  id: '5b7c9d1e-2f3a-4b5c-8d6e-7f8091a2b3c4',
  email: 'session-store@demo.fourpoint.test',
  role: 'operator' as const,
  clinicId: '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d',
  timeZone: 'UTC',
  name: 'Session Store',
};
const session = { accessToken: 'access-1', refreshToken: 'refresh-1', user };

afterEach(async () => {
  jest.restoreAllMocks();
  await AsyncStorage.clear();
});

const stored = async () =>
  JSON.parse((await AsyncStorage.getItem('fourpoint.session.v1')) ?? 'null') as unknown;

describe('session store', () => {
  test('when a session is saved on the web, then the refresh token is not written where page scripts read (ASVS V3.4)', async () => {
    jest.replaceProperty(Platform, 'OS', 'web');
    await saveSession(session);
    expect(await stored()).toEqual({ accessToken: 'access-1', user });
    expect(await loadSession()).toEqual({ accessToken: 'access-1', user });
  });

  test('when a session is saved on a phone, then the refresh token is kept for the next start', async () => {
    jest.replaceProperty(Platform, 'OS', 'ios');
    await saveSession(session);
    expect(await stored()).toEqual(session);
  });
});
