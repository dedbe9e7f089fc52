// Test runs log only warnings and errors the tests do not expect; the app's own request logs stay quiet.
import { setLogLevel } from '../../server/lib/logger.js';

setLogLevel('error');
