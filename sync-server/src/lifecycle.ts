// Whether this process is stopping (SIGTERM received). Readiness answers 503 from then on, so the load balancer
// sends new requests elsewhere while the requests in flight finish. One flag per process, set once by main.ts.
let stopping = false;

export function markStopping(): void {
  stopping = true;
}

export function isStopping(): boolean {
  return stopping;
}
