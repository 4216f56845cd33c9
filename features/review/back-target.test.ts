import { backTarget } from './back-target';

const client = '6f1c2a3b-4d5e-4f60-8a7b-9c0d1e2f3a4b';
const session = '0a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d';

describe('backTarget', () => {
  test('when trends were opened from a visit, then Back returns to that visit', () => {
    expect(backTarget(`session:${session}`, client, 'client')).toEqual({
      label: '← Back to the visit',
      href: `/sessions/${session}`,
    });
  });

  test('when trends were opened from the client page or a reload lost where from, then Back goes to the client page', () => {
    for (const from of ['client', undefined])
      expect(backTarget(from, client, 'client').href).toBe(`/review-clients/${client}`);
  });

  test('when a client page was opened from the follow-ups list, then Back returns to it; otherwise to the clients', () => {
    expect(backTarget('follow-ups', client, 'clients').href).toBe('/follow-ups');
    expect(backTarget(undefined, client, 'clients').href).toBe('/review-clients');
    expect(backTarget('session:not-an-id', client, 'clients').href).toBe('/review-clients');
  });
});
