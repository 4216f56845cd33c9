// findBy… and waitFor give up after this long. Their default (1 s) is shorter than a form's validation takes on a
// 2-core machine that is also running the server and browser tests, which made passing tests fail by the clock.
import { configure } from '@testing-library/react-native';

configure({ asyncUtilTimeout: 10_000 });
