import { render, screen } from '@testing-library/react-native';
import { useLocalClients } from '@/hooks/local-store/queries';
import type { LocalClient } from '@/hooks/local-store/records';
import { DeviceClients } from './device-clients';

jest.mock('@/hooks/local-store/queries', () => ({ useLocalClients: jest.fn() }));
jest.mock('expo-router', () => ({ router: { push: jest.fn() } }));

const mocked = useLocalClients as jest.MockedFunction<typeof useLocalClients>;

function client(id: string, origin: LocalClient['origin']): LocalClient {
  return {
    id,
    firstName: 'Tove',
    lastName: `Brannagh-${id}`,
    dateOfBirth: null,
    email: null,
    phone: null,
    origin,
    version: 0,
    createdAt: '',
    updatedAt: '',
  };
}

test('when clients are kept on the device, then those the clinic list lacks are listed, unsynced ones marked', () => {
  mocked.mockReturnValue({ data: [client('a', 'device'), client('b', 'server')] } as never);
  render(<DeviceClients search="" excludeIds={['b']} />);
  expect(screen.getByTestId('device-client-a')).toBeTruthy();
  expect(screen.queryByTestId('device-client-b')).toBeNull();
  expect(screen.getByText('Not yet synced')).toBeTruthy();
});

test('when the device keeps no one beyond the clinic list, then the section is not shown', () => {
  mocked.mockReturnValue({ data: [client('b', 'server')] } as never);
  render(<DeviceClients search="" excludeIds={['b']} />);
  expect(screen.queryByTestId('device-clients')).toBeNull();
});
