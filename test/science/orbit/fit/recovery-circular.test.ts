// Recovery of an invented orbit, 50 seeded realizations (about 10 s of CPU; see recovery.ts for the checks).
import { describe } from 'vitest';
import { CLASSES } from './classes.ts';
import { recoveryCheck } from './recovery.ts';

describe('orbit fit recovery', () => recoveryCheck(CLASSES.circular!));
