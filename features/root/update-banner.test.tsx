import { act, fireEvent, render, screen } from '@testing-library/react-native';
import { useHoldUpdates } from './app-update';
import type { AppRegistration, AppWorker, ServiceWorkerPort } from './service-worker-port';
import { UpdateBanner } from './update-banner';

// Only the browser's service-worker objects are stood in for; the banner and its rules run as they are.
// Their behaviour follows the Service Workers specification (W3C, "ServiceWorkerRegistration", "ServiceWorker
// state", "controllerchange"): a new worker goes installing → installed (waiting) → activated.

class FakeWorker implements AppWorker {
  state: ServiceWorkerState = 'installing';
  readonly messages: unknown[] = [];
  private listeners: (() => void)[] = [];
  postMessage(message: unknown) {
    this.messages.push(message);
  }
  addEventListener(_type: 'statechange', listener: () => void) {
    this.listeners.push(listener);
  }
  moveTo(state: ServiceWorkerState) {
    this.state = state;
    this.listeners.forEach((listener) => listener());
  }
}

class FakeRegistration implements AppRegistration {
  waiting: AppWorker | null = null;
  installing: AppWorker | null = null;
  updates = 0;
  private listeners: (() => void)[] = [];
  addEventListener(_type: 'updatefound', listener: () => void) {
    this.listeners.push(listener);
  }
  async update() {
    this.updates += 1;
  }
  /** A new version is found and installs: it ends up waiting. */
  install(worker: FakeWorker) {
    this.installing = worker;
    this.listeners.forEach((listener) => listener());
    worker.moveTo('installed');
    this.installing = null;
    this.waiting = worker;
  }
}

function fakeBrowser({
  controlled,
  registration = new FakeRegistration(),
}: {
  controlled: boolean;
  registration?: FakeRegistration;
}) {
  const controllerListeners: (() => void)[] = [];
  const reloads = { count: 0 };
  const port: ServiceWorkerPort = {
    register: async () => registration,
    hasController: () => controlled,
    onControllerChange: (listener) => {
      controllerListeners.push(listener);
      return () => controllerListeners.splice(controllerListeners.indexOf(listener), 1);
    },
    reloadPage: () => {
      reloads.count += 1;
    },
  };
  /** The waiting worker takes over the page (after SKIP_WAITING, or another tab's reload). */
  const takeOver = (worker: FakeWorker) => {
    worker.moveTo('activated');
    registration.waiting = null;
    controllerListeners.forEach((listener) => listener());
  };
  return { port, registration, reloads, takeOver };
}

function CaptureScreenStandIn({ unsealed }: { unsealed: boolean }) {
  useHoldUpdates(unsealed);
  return null;
}

async function settle() {
  await act(async () => {
    await Promise.resolve();
  });
}

test('when nothing new was installed, then nothing is announced', async () => {
  const browser = fakeBrowser({ controlled: true });
  render(<UpdateBanner port={browser.port} />);
  await settle();
  expect(screen.queryByTestId('update-banner')).toBeNull();
});

test('when the first service worker of a visit installs, then it is not announced as a new version', async () => {
  const browser = fakeBrowser({ controlled: false });
  render(<UpdateBanner port={browser.port} />);
  await settle();
  act(() => browser.registration.install(new FakeWorker()));
  expect(screen.queryByTestId('update-banner')).toBeNull();
});

test('when a new version installs while the app is open, then it says so in words and reloads only after Reload, once the new version serves the page', async () => {
  const browser = fakeBrowser({ controlled: true });
  render(<UpdateBanner port={browser.port} />);
  await settle();
  const worker = new FakeWorker();
  act(() => browser.registration.install(worker));

  expect(screen.getByText('A new version is ready.')).toBeTruthy();
  expect(browser.reloads.count).toBe(0);

  fireEvent.press(screen.getByTestId('update-reload'));
  // Workbox's generated service worker skips waiting on exactly this message.
  expect(worker.messages).toEqual([{ type: 'SKIP_WAITING' }]);
  expect(browser.reloads.count).toBe(0);
  act(() => browser.takeOver(worker));
  expect(browser.reloads.count).toBe(1);
});

test('when a new version was already waiting at start-up, then it is announced at once', async () => {
  const registration = new FakeRegistration();
  const worker = new FakeWorker();
  worker.state = 'installed';
  registration.waiting = worker;
  const browser = fakeBrowser({ controlled: true, registration });
  render(<UpdateBanner port={browser.port} />);
  await settle();
  expect(screen.getByTestId('update-reload')).toBeTruthy();
});

test('when another tab lets the new version take over, then this page does not reload itself', async () => {
  const browser = fakeBrowser({ controlled: true });
  render(<UpdateBanner port={browser.port} />);
  await settle();
  const worker = new FakeWorker();
  act(() => browser.registration.install(worker));
  act(() => browser.takeOver(worker));
  expect(browser.reloads.count).toBe(0);
  expect(screen.getByText('A new version is ready.')).toBeTruthy();

  // The person's Reload then reloads straight away: the new version already serves the page.
  fireEvent.press(screen.getByTestId('update-reload'));
  expect(worker.messages).toEqual([]);
  expect(browser.reloads.count).toBe(1);
});

test('when a session is unsealed on screen, then the new version is announced without a Reload until it is sealed', async () => {
  const browser = fakeBrowser({ controlled: true });
  const view = render(
    <>
      <CaptureScreenStandIn unsealed />
      <UpdateBanner port={browser.port} />
    </>,
  );
  await settle();
  const worker = new FakeWorker();
  act(() => browser.registration.install(worker));

  expect(
    screen.getByText('A new version is ready. You can reload once this session is sealed.'),
  ).toBeTruthy();
  expect(screen.queryByTestId('update-reload')).toBeNull();
  act(() => browser.takeOver(worker));
  expect(browser.reloads.count).toBe(0);

  view.rerender(
    <>
      <CaptureScreenStandIn unsealed={false} />
      <UpdateBanner port={browser.port} />
    </>,
  );
  expect(screen.getByText('A new version is ready.')).toBeTruthy();
  expect(screen.getByTestId('update-reload')).toBeTruthy();
});

test('when the app stays open, then it asks for a new version every half hour', async () => {
  jest.useFakeTimers();
  try {
    const browser = fakeBrowser({ controlled: true });
    render(<UpdateBanner port={browser.port} />);
    await settle();
    act(() => jest.advanceTimersByTime(60 * 60 * 1000));
    expect(browser.registration.updates).toBe(2);
  } finally {
    jest.useRealTimers();
  }
});
