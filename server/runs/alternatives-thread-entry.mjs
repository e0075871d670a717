// Worker threads start without the parent's TypeScript loader; register tsx here, then load the TS entry.
import { register } from 'tsx/esm/api';

register();
await import('./alternatives-thread.ts');
