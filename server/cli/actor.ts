/**
 * Who the command line writes as. A local command line needs no account: its changes are recorded
 * under the operating-system account that runs it (`via: cli`), which is who can open the data file
 * anyway. A command line acting through a server's token is recorded by that server as the
 * token's user (`tokenActor`).
 */
import { userInfo } from 'node:os';
import { commandLineActor, type Actor } from '../store/index.ts';

/**
 * The operating-system account running this process (USER/LOGNAME when the lookup fails, e.g. in a
 * container without a passwd entry).
 */
export function operatingSystemAccount(env: NodeJS.ProcessEnv = process.env): string {
  try {
    return userInfo().username;
  } catch {
    return env.USER ?? env.LOGNAME ?? 'unknown account';
  }
}

/** The local command line as the store's writer. */
export function localActor(): Actor {
  return commandLineActor(operatingSystemAccount());
}
