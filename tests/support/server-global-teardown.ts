export default async function globalTeardown(): Promise<void> {
  (globalThis as { __fourpointCluster?: { stop: () => void } }).__fourpointCluster?.stop();
}
