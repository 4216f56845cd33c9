// The Node test environment, plus a flag a failing test leaves behind, so the failure report
// (tests/support/e2e-failure-report.ts) runs only after a test failed. jest-circus calls handleTestEvent.
import NodeEnvironment from 'jest-environment-node';
import type { Circus } from '@jest/types';

export default class EndToEndEnvironment extends NodeEnvironment {
  handleTestEvent(event: Circus.Event): void {
    if (event.name === 'test_start') this.global.__fourpointFailedTest = undefined;
    if (event.name === 'test_fn_failure') this.global.__fourpointFailedTest = event.test.name;
  }
}
